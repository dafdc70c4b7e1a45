//! Optical materials: a complex refractive index N = n + i k (k >= 0 absorbs) as a function of
//! vacuum wavelength, each with its valid range. A constant, a published dispersion formula
//! (Sellmeier), or a table of n and k (linear in wavelength between its points).
//!
//! Architecture invariant: pure functions of SI numbers; outside its valid range a material
//! gives no value (`None`), and the caller says so to the user.

use super::film::Complex;

/// How a material's index is given.
#[derive(Debug, Clone, PartialEq)]
pub enum Dispersion {
    /// the same index at every wavelength
    Constant(Complex),
    /// n^2 = 1 + sum B_i lambda^2 / (lambda^2 - C_i), lambda in um, C_i in um^2, k = 0
    Sellmeier { b: Vec<f64>, c_um2: Vec<f64> },
    /// (wavelength [m], n, k), ascending in wavelength
    Table { wavelength_m: Vec<f64>, n: Vec<f64>, k: Vec<f64> },
}

/// A material with its name, source and valid range.
#[derive(Debug, Clone, PartialEq)]
pub struct Material {
    pub name: String,
    /// where its numbers come from (paper, table)
    pub source: String,
    pub dispersion: Dispersion,
    /// valid wavelengths [m], inclusive
    pub range_m: (f64, f64),
}

impl Material {
    /// A constant index, valid everywhere.
    pub fn constant(name: impl Into<String>, index: Complex) -> Material {
        Material {
            name: name.into(),
            source: "given".into(),
            dispersion: Dispersion::Constant(index),
            range_m: (0.0, f64::INFINITY),
        }
    }

    /// The index at vacuum wavelength `lambda_m` [m], or None outside the valid range.
    pub fn index_at(&self, lambda_m: f64) -> Option<Complex> {
        let (lo, hi) = self.range_m;
        if !(lambda_m >= lo * (1.0 - 1e-12) && lambda_m <= hi * (1.0 + 1e-12)) {
            return None;
        }
        Some(match &self.dispersion {
            Dispersion::Constant(c) => *c,
            Dispersion::Sellmeier { b, c_um2 } => {
                let l2 = (lambda_m * 1e6).powi(2);
                let n2 = 1.0 + b.iter().zip(c_um2).map(|(b, c)| b * l2 / (l2 - c)).sum::<f64>();
                Complex::real(n2.max(0.0).sqrt())
            }
            Dispersion::Table { wavelength_m, n, k } => {
                let i = wavelength_m.partition_point(|&x| x <= lambda_m);
                if i == 0 {
                    Complex::new(n[0], k[0])
                } else if i >= wavelength_m.len() {
                    Complex::new(n[n.len() - 1], k[k.len() - 1])
                } else {
                    let (a, b) = (wavelength_m[i - 1], wavelength_m[i]);
                    let t = (lambda_m - a) / (b - a);
                    Complex::new(n[i - 1] + t * (n[i] - n[i - 1]), (k[i - 1] + t * (k[i] - k[i - 1])).max(0.0))
                }
            }
        })
    }
}

/// A table of n and k: (wavelengths [m], n, k).
pub type NkTable = (Vec<f64>, Vec<f64>, Vec<f64>);

/// Read a table `wavelength_um,n,k` (with '#' comment lines and one header line), as the
/// built-in tables are written. Errors name the line.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn parse_nk_table(text: &str) -> Result<NkTable, String> {
    let (mut l, mut n, mut k) = (Vec::new(), Vec::new(), Vec::new());
    let mut header = false;
    for (i, line) in text.lines().enumerate() {
        let t = line.trim();
        if t.is_empty() || t.starts_with('#') {
            continue;
        }
        if !header {
            header = true;
            continue;
        }
        let f: Vec<f64> = t.split(',').filter_map(|x| x.trim().parse().ok()).collect();
        if f.len() != 3 || !(f[0] > 0.0) || !(f[1].is_finite() && f[2] >= 0.0 && f[2].is_finite()) {
            return Err(format!("line {}: expected wavelength_um,n,k with k >= 0, got '{t}'", i + 1));
        }
        if let Some(&last) = l.last() {
            if !(f[0] * 1e-6 > last) {
                return Err(format!("line {}: wavelengths must increase", i + 1));
            }
        }
        l.push(f[0] * 1e-6);
        n.push(f[1]);
        k.push(f[2]);
    }
    if l.len() < 2 {
        return Err("a table of n and k needs at least two rows".into());
    }
    Ok((l, n, k))
}

/// A built-in material: its name, what it is and where its numbers come from.
pub struct Builtin {
    pub name: &'static str,
    pub what: &'static str,
    pub build: fn() -> Material,
}

/// Fused silica by Malitson's Sellmeier formula (J. Opt. Soc. Am. 55, 1205 (1965)),
/// 0.21-3.71 um; coefficients as published (B: 0.6961663, 0.4079426, 0.8974794;
/// C: 0.0684043^2, 0.1162414^2, 9.896161^2 um^2), checked against the database's table of
/// the same paper in the tests.
fn silica_malitson() -> Material {
    Material {
        name: "silica".into(),
        source: "Malitson, J. Opt. Soc. Am. 55, 1205 (1965), Sellmeier".into(),
        dispersion: Dispersion::Sellmeier {
            b: vec![0.6961663, 0.4079426, 0.8974794],
            c_um2: vec![0.0684043f64.powi(2), 0.1162414f64.powi(2), 9.896161f64.powi(2)],
        },
        range_m: (0.21e-6, 3.71e-6),
    }
}

/// A built-in table (`wavelength_um,n,k`, shipped with the source; a bad one is a build bug,
/// caught by the tests, and gives an empty range here rather than a panic).
fn table(name: &str, source: &str, text: &str) -> Material {
    let (wavelength_m, n, k) = parse_nk_table(text).unwrap_or_default();
    let range_m = match (wavelength_m.first(), wavelength_m.last()) {
        (Some(a), Some(b)) => (*a, *b),
        _ => (1.0, 0.0),
    };
    Material { name: name.into(), source: source.into(), dispersion: Dispersion::Table { wavelength_m, n, k }, range_m }
}

fn table_sio2_kischkat() -> Material {
    table(
        "silica-ir",
        "Kischkat et al., Appl. Opt. 51, 6789 (2012); open refractive-index database (CC0), src/physics/data/materials/sio2_kischkat.csv",
        include_str!("data/materials/sio2_kischkat.csv"),
    )
}

fn table_si3n4_luke() -> Material {
    table(
        "si3n4",
        "Luke et al., Opt. Lett. 40, 4823 (2015); open refractive-index database (CC0), src/physics/data/materials/si3n4_luke.csv",
        include_str!("data/materials/si3n4_luke.csv"),
    )
}

fn table_si3n4_kischkat() -> Material {
    table(
        "si3n4-ir",
        "Kischkat et al., Appl. Opt. 51, 6789 (2012); open refractive-index database (CC0), src/physics/data/materials/si3n4_kischkat.csv",
        include_str!("data/materials/si3n4_kischkat.csv"),
    )
}

fn table_al2o3_kischkat() -> Material {
    table(
        "al2o3-ir",
        "Kischkat et al., Appl. Opt. 51, 6789 (2012); open refractive-index database (CC0), src/physics/data/materials/al2o3_kischkat.csv",
        include_str!("data/materials/al2o3_kischkat.csv"),
    )
}

fn table_tio2_kischkat() -> Material {
    table(
        "tio2-ir",
        "Kischkat et al., Appl. Opt. 51, 6789 (2012); open refractive-index database (CC0), src/physics/data/materials/tio2_kischkat.csv",
        include_str!("data/materials/tio2_kischkat.csv"),
    )
}

fn table_hfo2_bright() -> Material {
    table(
        "hfo2",
        "Bright et al., Thin Solid Films 520, 6793 (2012); open refractive-index database (CC0), src/physics/data/materials/hfo2_bright.csv",
        include_str!("data/materials/hfo2_bright.csv"),
    )
}

fn table_ag_rakic() -> Material {
    table(
        "ag",
        "Rakic et al., Appl. Opt. 37, 5271 (1998); open refractive-index database (CC0), src/physics/data/materials/ag_rakic.csv",
        include_str!("data/materials/ag_rakic.csv"),
    )
}

fn table_al_rakic() -> Material {
    table(
        "al",
        "Rakic et al., Appl. Opt. 37, 5271 (1998); open refractive-index database (CC0), src/physics/data/materials/al_rakic.csv",
        include_str!("data/materials/al_rakic.csv"),
    )
}

fn table_si_green2008() -> Material {
    table(
        "si",
        "Green, Sol. Energy Mater. Sol. Cells 92, 1305 (2008); open refractive-index database (CC0), src/physics/data/materials/si_green2008.csv",
        include_str!("data/materials/si_green2008.csv"),
    )
}

/// Every built-in material, in the order `glowgap film --materials` lists them.
pub const BUILTINS: &[Builtin] = &[
    Builtin { name: "silica", what: "fused silica, UV to near IR (Sellmeier)", build: silica_malitson },
    Builtin { name: "silica-ir", what: "fused silica (sputtered film), mid-IR", build: table_sio2_kischkat },
    Builtin { name: "si3n4", what: "silicon nitride, visible to mid-IR (Sellmeier)", build: table_si3n4_luke },
    Builtin { name: "si3n4-ir", what: "silicon nitride (film), mid-IR", build: table_si3n4_kischkat },
    Builtin { name: "al2o3-ir", what: "aluminium oxide (film), mid-IR", build: table_al2o3_kischkat },
    Builtin { name: "tio2-ir", what: "titanium dioxide (film), mid-IR", build: table_tio2_kischkat },
    Builtin { name: "hfo2", what: "hafnium dioxide (film), UV to far IR", build: table_hfo2_bright },
    Builtin { name: "ag", what: "silver, Lorentz-Drude fit (weak below 0.5 um)", build: table_ag_rakic },
    Builtin { name: "al", what: "aluminium, Lorentz-Drude fit", build: table_al_rakic },
    Builtin { name: "si", what: "crystalline silicon at 300 K", build: table_si_green2008 },
];

/// The built-in material called `name` (ASCII case ignored).
pub fn builtin(name: &str) -> Option<Material> {
    BUILTINS.iter().find(|b| b.name.eq_ignore_ascii_case(name)).map(|b| (b.build)())
}

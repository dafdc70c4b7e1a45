//! A layer stack as a scenario holds it: each layer's material (a built-in name, `n=REAL`,
//! `nk=N/K`, or a table read from a file by the front end) and thickness in nm, the
//! substrate and the incident medium, with their text forms and checks.
//!
//! Architecture invariant: holds what the user chose and nothing computed; every accepted
//! range of a film's settings lives here.

use crate::physics::film::{Complex, Layer};
use crate::physics::materials::{builtin, Dispersion, Material};
use serde::{Deserialize, Serialize};

/// Thicknesses taken [nm].
pub const THICKNESS_RANGE_NM: (f64, f64) = (0.0, 1e7);

/// A material as a scenario holds it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum MaterialSpec {
    /// a built-in material by name (`glowgap film --materials`)
    Builtin { name: String },
    /// a complex index N + iK, the same at every wavelength
    Index { n: f64, k: f64 },
    /// an n,k file on disk (command line); the front end replaces it by a table
    File { path: String },
    /// a table of n and k (SI wavelengths, ascending)
    Table { name: String, wavelength_m: Vec<f64>, n: Vec<f64>, k: Vec<f64> },
}

impl MaterialSpec {
    /// Parse `NAME | n=REAL | nk=N/K | file:PATH`.
    pub fn parse(text: &str) -> Result<MaterialSpec, String> {
        let t = text.trim();
        let lower = t.to_ascii_lowercase();
        let num = |s: &str, what: &str| {
            s.trim().parse::<f64>().map_err(|_| format!("'{text}': the {what} '{}' is not a number", s.trim()))
        };
        if let Some(v) = lower.strip_prefix("n=") {
            return Ok(MaterialSpec::Index { n: num(v, "index")?, k: 0.0 });
        }
        if let Some(v) = lower.strip_prefix("nk=") {
            let Some((n, k)) = v.split_once('/') else {
                return Err(format!("'{text}': give the complex index as nk=N/K, e.g. nk=2.1/0.05"));
            };
            return Ok(MaterialSpec::Index { n: num(n, "index n")?, k: num(k, "extinction k")? });
        }
        if let (Some(prefix), Some(path)) = (t.get(..5), t.get(5..)) {
            if prefix.eq_ignore_ascii_case("file:") && !path.is_empty() {
                return Ok(MaterialSpec::File { path: path.to_string() });
            }
        }
        if builtin(&lower).is_some() {
            return Ok(MaterialSpec::Builtin { name: lower });
        }
        Err(format!(
            "unknown material '{text}'; give a built-in name (glowgap film --materials lists them), n=REAL, nk=N/K or file:PATH"
        ))
    }

    /// Check and build the physics material.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn to_material(&self) -> Result<Material, String> {
        match self {
            MaterialSpec::Builtin { name } => {
                builtin(name).ok_or_else(|| format!("unknown built-in material '{name}'"))
            }
            MaterialSpec::Index { n, k } => {
                if !(n.is_finite() && *n > 0.0 && k.is_finite() && *k >= 0.0) {
                    return Err(format!(
                        "the index {n} + {k}i is not usable; give n above 0 and k of at least 0 (k > 0 absorbs)"
                    ));
                }
                Ok(Material::constant(format!("n={n}, k={k}"), Complex::new(*n, *k)))
            }
            MaterialSpec::File { path } => Err(format!("the n,k file '{path}' has not been read yet")),
            MaterialSpec::Table { name, wavelength_m, n, k } => {
                if wavelength_m.len() < 2 || n.len() != wavelength_m.len() || k.len() != wavelength_m.len() {
                    return Err(format!("the n,k table '{name}' needs at least two rows of wavelength, n and k"));
                }
                let (lo, hi) = (wavelength_m[0], wavelength_m[wavelength_m.len() - 1]);
                Ok(Material {
                    name: name.clone(),
                    source: format!("table '{name}'"),
                    dispersion: Dispersion::Table { wavelength_m: wavelength_m.clone(), n: n.clone(), k: k.clone() },
                    range_m: (lo, hi),
                })
            }
        }
    }
}

/// One layer: material and thickness [nm].
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct LayerSpec {
    pub material: MaterialSpec,
    pub thickness_nm: f64,
}

impl LayerSpec {
    /// Parse `MAT:THICKNESS_NM` (the material's own text may not contain ':' except file:).
    pub fn parse(text: &str) -> Result<LayerSpec, String> {
        let Some((m, d)) = text.rsplit_once(':') else {
            return Err(format!("the layer '{text}' is not MAT:THICKNESS_NM, e.g. sio2:120 or nk=2.1/0.01:80"));
        };
        let d: f64 = d
            .trim()
            .parse()
            .map_err(|_| format!("the layer '{text}': the thickness '{}' is not a number of nm", d.trim()))?;
        Ok(LayerSpec { material: MaterialSpec::parse(m)?, thickness_nm: d })
    }
}

/// The stack, its substrate and incident medium in SI: the incident index (real), the
/// layers' materials and thicknesses [m], the substrate's material.
#[derive(Debug, Clone)]
pub struct FilmInputs {
    pub incident: Material,
    pub layers: Vec<(Material, f64)>,
    pub substrate: Material,
}

impl FilmInputs {
    /// The stack at vacuum wavelength `lambda_m` [m]: (n0, layers, substrate), or the
    /// message naming the material whose range it leaves.
    pub fn at(&self, lambda_m: f64) -> Result<(f64, Vec<Layer>, Complex), String> {
        let index = |m: &Material| {
            m.index_at(lambda_m).ok_or_else(|| {
                format!(
                    "{} is known from {} to {} um only; {} um is outside",
                    m.name,
                    m.range_m.0 * 1e6,
                    m.range_m.1 * 1e6,
                    lambda_m * 1e6
                )
            })
        };
        let n0 = index(&self.incident)?;
        let layers = self
            .layers
            .iter()
            .map(|(m, d)| Ok(Layer { index: index(m)?, thickness_m: *d }))
            .collect::<Result<Vec<_>, String>>()?;
        Ok((n0.re, layers, index(&self.substrate)?))
    }
}

/// Check a stack and build its inputs.
pub fn film_inputs(
    incident: &MaterialSpec,
    layers: &[LayerSpec],
    substrate: &MaterialSpec,
) -> Result<FilmInputs, String> {
    let incident = incident.to_material()?;
    let lossless = match &incident.dispersion {
        Dispersion::Constant(c) => c.im == 0.0,
        Dispersion::Sellmeier { .. } => true,
        Dispersion::Table { k, .. } => k.iter().all(|k| *k == 0.0),
    };
    if !lossless {
        return Err("the incident medium must be lossless (k = 0), e.g. n=1 for air or n=1.5 for glass".into());
    }
    let mut out = Vec::with_capacity(layers.len());
    for (i, l) in layers.iter().enumerate() {
        let (lo, hi) = THICKNESS_RANGE_NM;
        if !(l.thickness_nm >= lo && l.thickness_nm <= hi) {
            return Err(format!(
                "layer {}: the thickness {} nm is out of range; give {lo} to {hi} nm",
                i + 1,
                l.thickness_nm
            ));
        }
        out.push((l.material.to_material().map_err(|e| format!("layer {}: {e}", i + 1))?, l.thickness_nm * 1e-9));
    }
    Ok(FilmInputs { incident, layers: out, substrate: substrate.to_material()? })
}

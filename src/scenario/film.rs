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

    /// The command-line text of this material (a table by its name).
    pub fn text(&self) -> String {
        match self {
            MaterialSpec::Builtin { name } => name.clone(),
            MaterialSpec::Index { n, k } if *k == 0.0 => format!("n={n}"),
            MaterialSpec::Index { n, k } => format!("nk={n}/{k}"),
            MaterialSpec::File { path } => format!("file:{path}"),
            MaterialSpec::Table { name, .. } => name.clone(),
        }
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

/// Whether a layer's fringes count: by the thickness rule
/// ([`crate::physics::film::COHERENCE_LIMIT_M`]), or as the user says.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum Coherence {
    #[default]
    Auto,
    Coherent,
    Incoherent,
}

/// One layer: material and thickness [nm].
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct LayerSpec {
    pub material: MaterialSpec,
    pub thickness_nm: f64,
    #[serde(default, skip_serializing_if = "is_auto")]
    pub coherence: Coherence,
}

fn is_auto(c: &Coherence) -> bool {
    *c == Coherence::Auto
}

impl LayerSpec {
    /// Parse `MAT:THICKNESS_NM[:coherent|:incoherent]` (the material's own text may not
    /// contain ':' except file:).
    pub fn parse(text: &str) -> Result<LayerSpec, String> {
        let (body, coherence) = match text.rsplit_once(':') {
            Some((b, w)) if w.trim().eq_ignore_ascii_case("coherent") => (b, Coherence::Coherent),
            Some((b, w)) if w.trim().eq_ignore_ascii_case("incoherent") => (b, Coherence::Incoherent),
            _ => (text, Coherence::Auto),
        };
        let Some((m, d)) = body.rsplit_once(':') else {
            return Err(format!("the layer '{text}' is not MAT:THICKNESS_NM, e.g. silica:120 or nk=2.1/0.01:80"));
        };
        let d: f64 = d
            .trim()
            .parse()
            .map_err(|_| format!("the layer '{text}': the thickness '{}' is not a number of nm", d.trim()))?;
        Ok(LayerSpec { material: MaterialSpec::parse(m)?, thickness_nm: d, coherence })
    }

    /// The command-line text of this layer (materials read from files by their name).
    pub fn text(&self) -> String {
        let tail = match self.coherence {
            Coherence::Auto => "",
            Coherence::Coherent => ":coherent",
            Coherence::Incoherent => ":incoherent",
        };
        format!("{}:{}{tail}", self.material.text(), self.thickness_nm)
    }
}

/// The stack, its substrate and incident medium in SI: the incident index (real), the
/// layers' materials and thicknesses [m], the substrate's material.
#[derive(Debug, Clone)]
pub struct FilmInputs {
    pub incident: Material,
    /// material, thickness [m], incoherent
    pub layers: Vec<(Material, f64, bool)>,
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
            .map(|(m, d, inc)| Ok(Layer { index: index(m)?, thickness_m: *d, incoherent: *inc }))
            .collect::<Result<Vec<_>, String>>()?;
        Ok((n0.re, layers, index(&self.substrate)?))
    }

    /// The stack at `lambda_m` [m] with every material held at its value at the nearest end
    /// of its valid range beyond it (see [`FilmInputs::held_warnings`]).
    pub fn at_held(&self, lambda_m: f64) -> (f64, Vec<Layer>, Complex) {
        let index = |m: &Material| {
            let l = lambda_m.clamp(m.range_m.0, m.range_m.1.max(m.range_m.0));
            m.index_at(l).unwrap_or(Complex::ONE)
        };
        let layers = self
            .layers
            .iter()
            .map(|(m, d, inc)| Layer { index: index(m), thickness_m: *d, incoherent: *inc })
            .collect();
        (index(&self.incident).re, layers, index(&self.substrate))
    }

    /// One warning for each material whose valid range leaves part of `needed_m` [m]
    /// uncovered: there [`FilmInputs::at_held`] holds its index at the end values (a
    /// material covering all of `needed_m` avoids it).
    pub fn held_warnings(&self, needed_m: (f64, f64)) -> Vec<String> {
        let mut seen: Vec<&str> = Vec::new();
        let mut out = Vec::new();
        let all = std::iter::once(&self.substrate).chain(self.layers.iter().map(|l| &l.0));
        for m in all {
            let (lo, hi) = m.range_m;
            if seen.contains(&m.name.as_str()) || (lo <= needed_m.0 && hi >= needed_m.1) {
                continue;
            }
            seen.push(&m.name);
            out.push(format!(
                "{} is known from {} to {} um; beyond, its index is held at the end values (figures there are rough)",
                m.name,
                round_um(lo),
                round_um(hi),
            ));
        }
        out
    }
}

/// A wavelength [m] in um to 4 significant digits, for messages.
fn round_um(m: f64) -> String {
    let um = m * 1e6;
    if !um.is_finite() {
        return "any".into();
    }
    let digits = (3 - um.abs().log10().floor() as i32).max(0) as usize;
    let t = format!("{um:.digits$}");
    if t.contains('.') {
        t.trim_end_matches('0').trim_end_matches('.').into()
    } else {
        t
    }
}

/// Which part of a stack a problem is in, so that each front end can name its own control.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FilmPart {
    Incident,
    /// the layer at this index (0 = the first, facing the light)
    Layer(usize),
    Substrate,
}

/// A problem with a stack: where it is and what is wrong.
#[derive(Debug, Clone, PartialEq)]
pub struct FilmError {
    pub part: FilmPart,
    pub message: String,
}

impl std::fmt::Display for FilmError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self.part {
            FilmPart::Incident => write!(f, "the incident medium: {}", self.message),
            FilmPart::Layer(i) => write!(f, "layer {}: {}", i + 1, self.message),
            FilmPart::Substrate => write!(f, "the substrate: {}", self.message),
        }
    }
}

impl From<FilmError> for String {
    fn from(e: FilmError) -> String {
        e.to_string()
    }
}

/// Check a stack and build its inputs.
pub fn film_inputs(
    incident: &MaterialSpec,
    layers: &[LayerSpec],
    substrate: &MaterialSpec,
) -> Result<FilmInputs, FilmError> {
    let err = |part: FilmPart, message: String| FilmError { part, message };
    let incident = incident.to_material().map_err(|m| err(FilmPart::Incident, m))?;
    let lossless = match &incident.dispersion {
        Dispersion::Constant(c) => c.im == 0.0,
        Dispersion::Sellmeier { .. } => true,
        Dispersion::Table { k, .. } => k.iter().all(|k| *k == 0.0),
    };
    if !lossless {
        return Err(err(FilmPart::Incident, "it must be lossless (k = 0), e.g. n=1 for air or n=1.5 for glass".into()));
    }
    let mut out = Vec::with_capacity(layers.len());
    for (i, l) in layers.iter().enumerate() {
        let (lo, hi) = THICKNESS_RANGE_NM;
        if !(l.thickness_nm >= lo && l.thickness_nm <= hi) {
            return Err(err(
                FilmPart::Layer(i),
                format!("the thickness {} nm is out of range; give {lo} to {hi} nm", l.thickness_nm),
            ));
        }
        let d = l.thickness_nm * 1e-9;
        let incoherent = match l.coherence {
            Coherence::Auto => d > crate::physics::film::COHERENCE_LIMIT_M,
            Coherence::Coherent => false,
            Coherence::Incoherent => true,
        };
        out.push((l.material.to_material().map_err(|m| err(FilmPart::Layer(i), m))?, d, incoherent));
    }
    let substrate = substrate.to_material().map_err(|m| err(FilmPart::Substrate, m))?;
    Ok(FilmInputs { incident, layers: out, substrate })
}

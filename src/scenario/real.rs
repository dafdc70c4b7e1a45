//! A real absorber as a scenario holds it: silicon (built in) or an alpha / n,k table, its
//! thickness in um, light trapping and doping, with their text forms and checks.
//!
//! Architecture invariant: holds what the user chose and nothing computed; every accepted
//! range of a real absorber's settings lives here.

use crate::physics::junction::Illumination;
use crate::physics::real_cell::RealCellModel;
use crate::physics::silicon::{Doping, RealAbsorber, Trapping};
use crate::physics::stack::mixed::RealBottom;
use serde::{Deserialize, Serialize};
use std::sync::Arc;

/// Accepted absorber thicknesses [um].
pub const THICKNESS_RANGE_UM: (f64, f64) = (0.01, 100_000.0);
/// Accepted thickness-sweep points.
pub const SWEEP_POINTS: (usize, usize) = (2, 10_000);
/// Accepted doping densities [cm^-3].
pub const DOPING_RANGE_CM3: (f64, f64) = (0.0, 1e20);

/// The absorber's material.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum RealMaterial {
    /// crystalline silicon at 300 K (Green 2008), with its Auger recombination
    Silicon,
    /// a table of n and k (SI wavelengths, ascending), radiative limit only
    Table { name: String, wavelength_m: Vec<f64>, n: Vec<f64>, k: Vec<f64> },
    /// a table on disk (command line); the front end replaces it by a table
    File { path: String },
}

/// Light trapping as a scenario holds it.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum TrappingSpec {
    #[default]
    Lambertian,
    SinglePass,
    DoublePass,
}

impl TrappingSpec {
    pub fn parse(text: &str) -> Result<TrappingSpec, String> {
        match text.trim().to_ascii_lowercase().as_str() {
            "lambertian" => Ok(TrappingSpec::Lambertian),
            "single-pass" => Ok(TrappingSpec::SinglePass),
            "double-pass" => Ok(TrappingSpec::DoublePass),
            other => Err(format!("unknown light trapping '{other}'; use lambertian, single-pass or double-pass")),
        }
    }

    pub fn label(self) -> &'static str {
        match self {
            TrappingSpec::Lambertian => "lambertian",
            TrappingSpec::SinglePass => "single-pass",
            TrappingSpec::DoublePass => "double-pass",
        }
    }
}

/// Doping type.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum DopingType {
    #[default]
    N,
    P,
}

/// A real absorber.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RealAbsorberSpec {
    pub material: RealMaterial,
    pub thickness_um: f64,
    #[serde(default)]
    pub trapping: TrappingSpec,
    #[serde(default)]
    pub doping_type: DopingType,
    /// [cm^-3]; 0 = undoped
    #[serde(default)]
    pub doping_cm3: f64,
}

impl RealAbsorberSpec {
    /// Parse `silicon:THICKNESS_UM` or `file:PATH:THICKNESS_UM`.
    pub fn parse(text: &str) -> Result<RealAbsorberSpec, String> {
        let t = text.trim();
        let Some((m, w)) = t.rsplit_once(':') else {
            return Err(format!("'{t}' is not MATERIAL:THICKNESS_UM; write e.g. silicon:110"));
        };
        let thickness_um: f64 = w.trim().parse().map_err(|_| {
            format!("'{t}': the thickness '{}' is not a number of um; write e.g. silicon:110", w.trim())
        })?;
        let material = if m.trim().eq_ignore_ascii_case("silicon") || m.trim().eq_ignore_ascii_case("si") {
            RealMaterial::Silicon
        } else if let (Some(p), Some(path)) = (m.get(..5), m.get(5..)) {
            if p.eq_ignore_ascii_case("file:") && !path.is_empty() {
                RealMaterial::File { path: path.to_string() }
            } else {
                return Err(format!("unknown absorber '{m}'; use silicon:THICKNESS_UM or file:PATH:THICKNESS_UM"));
            }
        } else {
            return Err(format!("unknown absorber '{m}'; use silicon:THICKNESS_UM or file:PATH:THICKNESS_UM"));
        };
        Ok(RealAbsorberSpec {
            material,
            thickness_um,
            trapping: TrappingSpec::default(),
            doping_type: DopingType::default(),
            doping_cm3: 0.0,
        })
    }

    /// Whether Auger recombination is included (silicon only).
    pub fn auger_limited(&self) -> bool {
        matches!(self.material, RealMaterial::Silicon)
    }

    /// The material's name: `silicon`, or the table's name or path.
    pub fn material_name(&self) -> String {
        match &self.material {
            RealMaterial::Silicon => "silicon".into(),
            RealMaterial::Table { name, .. } => name.clone(),
            RealMaterial::File { path } => path.clone(),
        }
    }

    /// A short description.
    pub fn label(&self) -> String {
        let m = match &self.material {
            RealMaterial::Silicon => "silicon (Green 2008; Auger by Richter 2012)".to_string(),
            RealMaterial::Table { name, .. } => format!("table '{name}' (radiative limit)"),
            RealMaterial::File { path } => format!("file {path}"),
        };
        let doping = if self.doping_cm3 > 0.0 {
            format!(", {}-type {:e} cm^-3", if self.doping_type == DopingType::N { "n" } else { "p" }, self.doping_cm3)
        } else {
            ", undoped".into()
        };
        format!("{m}, {} um, {} trapping{doping}", self.thickness_um, self.trapping.label())
    }

    /// Check and build the physics absorber and doping.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a >= b) on purpose: it also refuses NaN
    pub fn to_physics(&self) -> Result<(RealAbsorber, Doping), String> {
        self.with_thickness(self.thickness_um)
    }

    /// [`RealAbsorberSpec::to_physics`] at another thickness [um] (for sweeps).
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a >= b) on purpose: it also refuses NaN
    pub fn with_thickness(&self, thickness_um: f64) -> Result<(RealAbsorber, Doping), String> {
        let (lo, hi) = THICKNESS_RANGE_UM;
        if !(thickness_um >= lo && thickness_um <= hi) {
            return Err(format!(
                "the absorber thickness {thickness_um} um is out of range; give {lo} to {hi} um, e.g. 110"
            ));
        }
        let (dlo, dhi) = DOPING_RANGE_CM3;
        if !(self.doping_cm3 >= dlo && self.doping_cm3 <= dhi) {
            return Err(format!(
                "the doping {} cm^-3 is out of range; give 0 (undoped) to {dhi:e} cm^-3, e.g. 1e15",
                self.doping_cm3
            ));
        }
        let trapping = match self.trapping {
            TrappingSpec::Lambertian => Trapping::Lambertian,
            TrappingSpec::SinglePass => Trapping::SinglePass,
            TrappingSpec::DoublePass => Trapping::DoublePass,
        };
        let w = thickness_um * 1e-6;
        let abs = match &self.material {
            RealMaterial::Silicon => RealAbsorber::silicon(w, trapping).ok_or("the silicon table is missing")?,
            RealMaterial::Table { name, wavelength_m, n, k } => {
                if wavelength_m.len() < 2 || n.len() != wavelength_m.len() || k.len() != wavelength_m.len() {
                    return Err(format!("the absorber table '{name}' needs at least two rows of wavelength, n and k"));
                }
                RealAbsorber::from_nk(wavelength_m, n, k, w, trapping)
            }
            RealMaterial::File { path } => return Err(format!("the absorber file '{path}' has not been read yet")),
        };
        let d = self.doping_cm3 * 1e6;
        let doping = if d == 0.0 {
            Doping::Undoped
        } else if self.doping_type == DopingType::N {
            Doping::NType(d)
        } else {
            Doping::PType(d)
        };
        Ok((abs, doping))
    }
}

/// A real absorber ready to solve at any thickness: the model under one light and cell
/// temperature, and the chosen thickness and trapping.
#[derive(Debug, Clone)]
pub struct RealSetup {
    pub model: Arc<RealCellModel>,
    /// [m]
    pub thickness_m: f64,
    pub trapping: Trapping,
    /// Auger recombination included (silicon)
    pub auger: bool,
}

impl RealSetup {
    /// The bottom subcell of a stack.
    pub fn bottom(&self) -> RealBottom {
        RealBottom { model: self.model.clone(), thickness_m: self.thickness_m, trapping: self.trapping }
    }
}

impl RealAbsorberSpec {
    /// Check every setting and build the model under `light` at `cell_temp_k` [K].
    pub fn setup(&self, light: &Illumination, cell_temp_k: f64) -> Result<RealSetup, String> {
        let (abs, doping) = self.to_physics()?;
        let auger = self.auger_limited();
        let model = RealCellModel::new(&abs, light, cell_temp_k, doping, auger);
        Ok(RealSetup { model: Arc::new(model), thickness_m: abs.thickness_m, trapping: abs.trapping, auger })
    }
}

/// Check a thickness sweep FROM to TO um with N points (log-spaced); returns the
/// thicknesses [um].
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn thickness_sweep(from_um: f64, to_um: f64, points: usize) -> Result<Vec<f64>, String> {
    let (lo, hi) = THICKNESS_RANGE_UM;
    let (nlo, nhi) = SWEEP_POINTS;
    if !(from_um >= lo && to_um <= hi && from_um < to_um) {
        return Err(format!(
            "the thickness range {from_um}-{to_um} um is not usable; give two thicknesses from {lo} to {hi} um, the thinner first"
        ));
    }
    if !(nlo..=nhi).contains(&points) {
        return Err(format!("the thickness sweep needs {nlo} to {nhi} points, {points} given"));
    }
    Ok((0..points).map(|i| from_um * (to_um / from_um).powf(i as f64 / (points - 1) as f64)).collect())
}

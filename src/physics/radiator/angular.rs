//! How an emitter's emissivity depends on the direction of emission.
//!
//! The directional spectral emissivity eps(lambda, theta) of an opaque surface equals its
//! directional spectral absorptance (Kirchhoff's law, Kirchhoff, Ann. Phys. 185, 275, 1860;
//! in its directional form e.g. Modest, Radiative Heat Transfer, 3rd ed., 2013, ch. 3).
//! The hemispherical value that sets the emitted flux is the cosine-weighted mean over the
//! hemisphere (the definition of hemispherical emittance, Modest 2013, ch. 3):
//!   eps_h(lambda) = 2 integral_0^1 eps(lambda, mu) mu dmu,   mu = cos(theta).

/// The angular behaviour of an emitter.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub enum AngularModel {
    #[default]
    /// Emissivity independent of direction (a Lambertian, diffuse emitter: Lambert,
    /// Photometria, 1760): eps(lambda, theta) = eps(lambda).
    Lambertian,
    /// An idealized angle-selective emitter: eps(lambda, theta) = eps(lambda) for
    /// theta < `angle_rad` and `beyond` (a fraction 0-1, at every wavelength) from the
    /// cut-off angle to grazing. `angle_rad` [rad] in (0, pi/2].
    CutOff { angle_rad: f64, beyond: f64 },
}

impl AngularModel {
    /// cos of the cut-off angle (dimensionless; 0 for the Lambertian case: no cut-off above
    /// the horizon), clamped to [0, 1].
    pub fn cos_cut(&self) -> f64 {
        match self {
            AngularModel::Lambertian => 0.0,
            AngularModel::CutOff { angle_rad, .. } => {
                let c = angle_rad.cos();
                if c.is_nan() {
                    0.0
                } else {
                    c.clamp(0.0, 1.0)
                }
            }
        }
    }

    /// Directional emissivity (dimensionless) at mu = cos(theta) for a surface whose normal
    /// emissivity at this wavelength is `eps` (fraction). Emission up to and including the
    /// cut-off angle keeps `eps`.
    #[inline]
    pub fn apply(&self, eps: f64, mu: f64) -> f64 {
        match self {
            AngularModel::Lambertian => eps,
            AngularModel::CutOff { beyond, .. } => {
                if mu >= self.cos_cut() {
                    eps
                } else {
                    clamp_fraction(*beyond)
                }
            }
        }
    }

    /// Hemispherical emissivity (dimensionless) for normal emissivity `eps` (fraction), in
    /// closed form (the cosine-weighted mean of the module docs):
    /// 2 integral_0^1 apply(eps, mu) mu dmu = eps (1 - mu_c^2) + beyond mu_c^2
    /// (the integral of 2 mu over [mu_c, 1] is 1 - mu_c^2 = sin^2 theta_c).
    #[inline]
    pub fn hemispherical(&self, eps: f64) -> f64 {
        match self {
            AngularModel::Lambertian => eps,
            AngularModel::CutOff { beyond, .. } => {
                let c2 = self.cos_cut() * self.cos_cut();
                eps * (1.0 - c2) + clamp_fraction(*beyond) * c2
            }
        }
    }

    /// The pieces of [0, 1] in mu = cos(theta) (dimensionless) on which the model is
    /// constant, for quadrature.
    pub fn mu_pieces(&self) -> Vec<(f64, f64)> {
        let c = self.cos_cut();
        if c > 0.0 && c < 1.0 {
            vec![(0.0, c), (c, 1.0)]
        } else {
            vec![(0.0, 1.0)]
        }
    }
}

/// A fraction in [0, 1]; NaN counts as 0 so that no NaN can leave the physics.
#[inline]
pub fn clamp_fraction(v: f64) -> f64 {
    if v.is_nan() {
        0.0
    } else {
        v.clamp(0.0, 1.0)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::radiator::quadrature::GaussRule;

    #[test]
    fn hemispherical_closed_form_matches_quadrature() {
        let m = AngularModel::CutOff { angle_rad: 1.0, beyond: 0.2 };
        let q: f64 = m
            .mu_pieces()
            .into_iter()
            .map(|(a, b)| GaussRule::new(32).integrate(a, b, |mu| 2.0 * m.apply(0.9, mu) * mu))
            .sum();
        assert!((q - m.hemispherical(0.9)).abs() < 1e-14);
        // 60 deg cut-off, nothing beyond: sin^2(60 deg) = 3/4 of the normal value
        let m = AngularModel::CutOff { angle_rad: std::f64::consts::FRAC_PI_3, beyond: 0.0 };
        assert!((m.hemispherical(1.0) - 0.75).abs() < 1e-15);
    }
}

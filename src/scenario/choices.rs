//! The choices a scenario stores that name a physics option: which faces emit, the J-V
//! model, a table's spectral axis and quantity, the stack's connection and where a fixed gap
//! sits.
//!
//! Architecture invariant: the names written into links, scenario files and the command
//! line's JSON are spelled out here, one per variant, and belong to the scenario; the physics
//! enums carry no serde. Each scenario enum converts into its physics counterpart (`From`,
//! or `to_physics()`) and back, matching variant for variant, so renaming or adding a physics
//! variant fails to compile here instead of silently changing what old links mean.

use crate::physics::junction::{Emission as PhysicsEmission, JvModel as PhysicsJvModel};
use crate::physics::spectrum::{Axis as PhysicsAxis, Quantity as PhysicsQuantity};
use crate::physics::stack::optimize::FixAt as PhysicsFixAt;
use crate::physics::stack::Connection as PhysicsConnection;
use serde::{Deserialize, Serialize};

/// Declares a scenario enum whose variants carry their names in links (`Variant = "name"`)
/// and map one to one onto a physics enum's variants (`=> PhysicsVariant`).
macro_rules! scenario_choice {
    (
        $(#[$meta:meta])*
        pub enum $name:ident => $physics:ident {
            $( $(#[$vmeta:meta])* $variant:ident = $wire:literal => $pvariant:ident, )+
        }
    ) => {
        $(#[$meta])*
        #[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
        pub enum $name {
            $( $(#[$vmeta])* #[serde(rename = $wire)] $variant, )+
        }

        impl $name {
            /// Every variant, in declaration order.
            pub const ALL: &'static [$name] = &[$($name::$variant),+];

            /// The name in links, scenario files and the command line's JSON.
            pub fn label(self) -> &'static str {
                match self {
                    $($name::$variant => $wire,)+
                }
            }

            /// The physics option this choice stands for.
            pub fn to_physics(self) -> $physics {
                self.into()
            }
        }

        impl From<$name> for $physics {
            fn from(v: $name) -> $physics {
                match v {
                    $($name::$variant => $physics::$pvariant,)+
                }
            }
        }

        impl From<$physics> for $name {
            fn from(v: $physics) -> $name {
                match v {
                    $($physics::$pvariant => $name::$variant,)+
                }
            }
        }
    };
}

scenario_choice! {
    /// Which faces of the cell emit.
    #[derive(Default)]
    pub enum Emission => PhysicsEmission {
        /// the front face only (a perfect mirror behind the cell); default
        #[default]
        Front = "front" => Front,
        /// both faces (no back mirror): twice the radiative current
        Both = "both" => Both,
    }
}

scenario_choice! {
    /// How the J-V curve is computed.
    #[derive(Default)]
    pub enum JvModel => PhysicsJvModel {
        /// the generalized Planck law with chemical potential qV; default
        #[default]
        Exact = "exact" => Exact,
        /// the Boltzmann approximation
        Boltzmann = "boltzmann" => Boltzmann,
    }
}

scenario_choice! {
    /// The spectral axis of a table carried in a scenario (coordinates in SI: m, J, m^-1).
    pub enum Axis => PhysicsAxis {
        /// wavelength [m]
        Wavelength = "wavelength" => Wavelength,
        /// photon energy [J]
        PhotonEnergy = "photon-energy" => PhotonEnergy,
        /// wavenumber [m^-1]
        Wavenumber = "wavenumber" => Wavenumber,
    }
}

scenario_choice! {
    /// What a spectrum table's values measure, per unit of its axis.
    pub enum Quantity => PhysicsQuantity {
        /// spectral irradiance [W m^-2 per axis unit]
        Irradiance = "irradiance" => Irradiance,
        /// spectral photon flux [photons s^-1 m^-2 per axis unit]
        PhotonFlux = "photon-flux" => PhotonFlux,
    }
}

scenario_choice! {
    /// How the subcells of a stack are wired.
    #[derive(Default)]
    pub enum Connection => PhysicsConnection {
        /// two-terminal: one current through every subcell; default
        #[default]
        Series = "series" => Series,
        /// multi-terminal: every subcell at its own maximum power point
        Independent = "independent" => Independent,
    }
}

scenario_choice! {
    /// Where the optimizer's fixed gap must sit in the stack.
    #[derive(Default)]
    pub enum FixAt => PhysicsFixAt {
        /// anywhere; default
        #[default]
        Any = "any" => Any,
        /// the fixed gap is the top cell
        Top = "top" => Top,
        /// the fixed gap is the bottom cell
        Bottom = "bottom" => Bottom,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The names old links and the command line's JSON use; changing one breaks them.
    #[test]
    fn names_in_links_are_fixed() {
        let names = |labels: Vec<&str>| labels.join(" ");
        assert_eq!(names(Emission::ALL.iter().map(|v| v.label()).collect()), "front both");
        assert_eq!(names(JvModel::ALL.iter().map(|v| v.label()).collect()), "exact boltzmann");
        assert_eq!(names(Axis::ALL.iter().map(|v| v.label()).collect()), "wavelength photon-energy wavenumber");
        assert_eq!(names(Quantity::ALL.iter().map(|v| v.label()).collect()), "irradiance photon-flux");
        assert_eq!(names(Connection::ALL.iter().map(|v| v.label()).collect()), "series independent");
        assert_eq!(names(FixAt::ALL.iter().map(|v| v.label()).collect()), "any top bottom");
        for c in Connection::ALL {
            assert_eq!(serde_json::to_string(c).unwrap(), format!("\"{}\"", c.label()));
            assert_eq!(Connection::from(c.to_physics()), *c);
        }
        for a in Axis::ALL {
            assert_eq!(serde_json::from_str::<Axis>(&format!("\"{}\"", a.label())).unwrap(), *a);
            assert_eq!(Axis::from(a.to_physics()), *a);
        }
    }
}

//! The page's controls that a message can be attached to, by name. The page shows an edit's
//! refusal next to its control (`data-error` = [`Control::as_str`]); a typed name means a
//! misspelt hook does not compile into a message nobody sees.
//!
//! Architecture invariant: every control hook the app keys messages by is a variant here,
//! and [`Control::as_str`] is the one place its text is written.

macro_rules! controls {
    ($($variant:ident => $hook:literal,)*) => {
        /// A control of the page (a field, a choice, a plot used as a control).
        #[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
        pub enum Control {
            $($variant,)*
        }

        impl Control {
            /// Every control, in declaration order.
            pub const ALL: &'static [Control] = &[$(Control::$variant,)*];

            /// The hook text: the `data-control`/`data-error` attribute and the element ids'
            /// suffix.
            pub fn as_str(self) -> &'static str {
                match self {
                    $(Control::$variant => $hook,)*
                }
            }
        }
    };
}

controls! {
    Panel => "panel",
    Link => "link",
    Spectrum => "spectrum",
    BlackbodyTemp => "blackbody-temp",
    Concentration => "concentration",
    CellTemp => "cell-temp",
    Ere => "ere",
    Emission => "emission",
    Model => "model",
    Gap => "gap",
    GapNm => "gap-nm",
    GapMaterial => "gap-material",
    CurveRange => "curve-range",
    Absorber => "absorber",
    Urbach => "urbach",
    EqeFile => "eqe-file",
    Ambient => "ambient",
    Connection => "connection",
    Dew => "dew",
    EmissivityEditor => "emissivity-editor",
    EmissivityFile => "emissivity-file",
    EmissivityPreset => "emissivity-preset",
    FixAt => "fix-at",
    FixGap => "fix-gap",
    GreyEmissivity => "grey-emissivity",
    Hc => "hc",
    Junctions => "junctions",
    NetCurveRange => "net-curve-range",
    Optimize => "optimize",
    Pwv => "pwv",
    Sky => "sky",
    SkyFile => "sky-file",
    SpectrumAxis => "spectrum-axis",
    SpectrumQuantity => "spectrum-quantity",
    StackGaps => "stack-gaps",
    StackSpectrum => "stack-spectrum",
    Sun => "sun",
    SunScale => "sun-scale",
    SunSpectrum => "sun-spectrum",
    SunZenith => "sun-zenith",
    Surface => "surface",
    TandemMap => "tandem-map",
    EmissivityPoints => "emissivity-points",
    Gap1 => "gap-1",
    Gap2 => "gap-2",
    Gap3 => "gap-3",
    Gap4 => "gap-4",
    Gap5 => "gap-5",
    Gap6 => "gap-6",
    HotBlackbodyTemp => "hot-bb-temp",
    HotBand => "hot-band",
    HotBandTo => "hot-band-to",
    HotAxes => "hot-axes",
    TpvEmitter => "tpv-emitter",
    TpvEmitterTemp => "tpv-emitter-temp",
    TpvViewFactor => "tpv-view-factor",
    TpvGaps => "tpv-gaps",
    TpvConnection => "tpv-connection",
    TpvEre => "tpv-ere",
    TpvCellTemp => "tpv-cell-temp",
    TpvSubgapReflectance => "tpv-subgap-reflectance",
    TpvTradeoffRange => "tpv-tradeoff-range",
    AbsSurface => "abs-surface",
    AbsCutoff => "abs-cutoff",
    AbsProfile => "abs-profile",
    AbsTemp => "abs-temp",
    AbsConcentration => "abs-concentration",
    AbsSource => "abs-source",
    AbsSunTemp => "abs-sun-temp",
    AbsAmbient => "abs-ambient",
    AbsHc => "abs-hc",
    EmitterKind => "emitter-kind",
    FilmLayers => "film-layers",
    FilmSubstrate => "film-substrate",
    FilmStack => "film-stack",
    FilmTarget => "film-target",
    FilmTargetProfile => "film-target-profile",
    FilmMaxThickness => "film-max-thickness",
    FilmOptimize => "film-optimize",
    SiThickness => "si-thickness",
    SiTrapping => "si-trapping",
    SiDoping => "si-doping",
    StackBottom => "stack-bottom",
    BottomThickness => "bottom-thickness",
    BottomTrapping => "bottom-trapping",
    BottomDoping => "bottom-doping",
    Coupling => "luminescent-coupling",
    PlaceLat => "place-lat",
    PlaceLon => "place-lon",
    PlaceExample => "place-example",
    PlaceDate => "place-date",
    PlaceTime => "place-time",
    PlaceTilt => "place-tilt",
    PlaceAzimuth => "place-azimuth",
    PlaceElevation => "place-elevation",
    PlacePwv => "place-pwv",
    PlaceOzone => "place-ozone",
    PlaceAod => "place-aod500",
    PlaceAngstrom => "place-angstrom",
    PlaceAlbedo => "place-albedo",
    PlaceSky => "place-sky-model",
}

impl std::fmt::Display for Control {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.as_str())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn hooks_are_unique_and_plain() {
        let mut seen = std::collections::BTreeSet::new();
        for c in Control::ALL {
            let h = c.as_str();
            assert!(seen.insert(h), "{h} twice");
            // a hook is used in CSS selectors and element ids: lower-case words and hyphens
            assert!(h.chars().all(|ch| ch.is_ascii_lowercase() || ch.is_ascii_digit() || ch == '-'), "{h}");
        }
    }
}

//! The "Place and time (clear sky)" light source, shared by every tab that takes a sun: the
//! place (latitude, longitude, example sites), the date, the time-of-day slider, the plane
//! (tilt, azimuth), the atmosphere, the sun's figures at the slider's time with the night
//! notice, and the day chart (the plane's irradiance and a device's power through the day).
//!
//! A tab passes how to read and write its clear-sky source in the scenario ([`PlaceSlot`]);
//! every edit goes through [`Ctx::edit`], so a refused value leaves the scenario (and the
//! figures) as they were and says why next to its control. The page keeps one shared place
//! ([`Ctx::place`]): choosing the source in another tab starts from the last place used.

use std::rc::Rc;
use std::sync::Arc;

use leptos::ev;
use leptos::prelude::*;

use crate::app::state::{mark, sentence, Ctx};
use crate::app::widgets::fields::{number_field, plain_parse, Field};
use crate::scenario::place::{ClearSkySpec, PlaceSpec, SkyChoice};
use crate::view::controls::Control;
use crate::view::format as fmt;
use crate::view::place::{
    atmosphere_hint, clock_minutes, date_text, sun_figures, svg_body, with_date, with_minutes, with_place, x_of,
    DayPlot, DayText, PlaceSlot, BOTTOM, DAY_STEP_MIN, EXAMPLES, H, LEFT, RIGHT, SLIDER_MAX_MIN, TOP, W,
};

/// The place controls' own state beside the scenario: where the time slider is (it may rest
/// at a night time that the scenario refused).
#[derive(Clone, Copy)]
pub struct PlaceUi {
    pub ctx: Ctx,
    pub slot: PlaceSlot,
    /// the spec in force: the tab's own, else the page's last place
    pub spec: Memo<ClearSkySpec>,
    /// the slider's time [min from local midnight]
    pub slider: RwSignal<u32>,
    /// the notice shown while the slider rests where the plane is dark
    pub dark: RwSignal<Option<String>>,
}

impl PlaceUi {
    pub fn new(ctx: Ctx, slot: PlaceSlot) -> PlaceUi {
        let spec = Memo::new(move |_| ctx.scenario.with(|s| (slot.get)(s)).unwrap_or_else(|| ctx.place.get()));
        let slider = RwSignal::new(clock_minutes(&spec.get_untracked()).unwrap_or(720));
        let dark = RwSignal::new(None);
        // the slider follows the scenario (a link, another tab, a date)
        Effect::new(move |_| {
            let m = clock_minutes(&spec.get()).unwrap_or(720);
            if slider.get_untracked() != m && dark.get_untracked().is_none() {
                slider.set(m);
            }
        });
        PlaceUi { ctx, slot, spec, slider, dark }
    }

    /// Whether the tab's source is the clear sky.
    pub fn active(&self) -> bool {
        self.ctx.scenario.with(|s| (self.slot.get)(s).is_some())
    }

    /// Try `next` under `hook`: refused with a message when it cannot be read or its plane
    /// is dark at its time; otherwise committed to the scenario (when the tab's source is the
    /// clear sky) and remembered as the page's place.
    pub fn apply(&self, hook: Control, next: ClearSkySpec) -> bool {
        let ctx = self.ctx;
        let figures = match sun_figures(&next) {
            Ok(f) => f,
            Err(e) => {
                ctx.set_error(hook, sentence(&e));
                return false;
            }
        };
        if let Some(n) = figures.dark_notice() {
            if hook == Control::PlaceTime {
                ctx.clear_error(hook);
                self.dark.set(Some(n));
            } else {
                ctx.set_error(hook, n);
            }
            return false;
        }
        self.dark.set(None);
        ctx.clear_error(Control::PlaceTime);
        let set = self.slot.set;
        let ok = if self.active() {
            let spec = next.clone();
            ctx.edit(hook, move |s| set(s, spec))
        } else {
            ctx.clear_error(hook);
            true
        };
        if ok {
            ctx.place.set(next);
        }
        ok
    }
}

/// One numeric field of the place.
struct PlaceField {
    label: &'static str,
    unit: &'static str,
    hook: Control,
    hint: String,
    example: &'static str,
    get: fn(&PlaceSpec) -> f64,
    put: fn(&mut PlaceSpec, f64),
    /// a new longitude moves the clock's UTC offset
    moves_clock: bool,
}

fn place_number(ui: PlaceUi, f: PlaceField) -> impl IntoView {
    let PlaceField { label, unit, hook, hint, example, get, put, moves_clock } = f;
    let value = Memo::new(move |_| ui.spec.with(|s| get(&s.place)));
    let field =
        Field { label, unit, hook, hint: Some(hint), example, value, show: |v| fmt::field(v, 8), parse: plain_parse };
    let commit: Rc<dyn Fn(f64) -> bool> = Rc::new(move |v| {
        let spec = ui.spec.get_untracked();
        let mut place = spec.place.clone();
        put(&mut place, v);
        // the place's own check first, so the message names this field
        if let Err(e) = place.to_site() {
            ui.ctx.set_error(hook, sentence(&e));
            return false;
        }
        let next = if moves_clock {
            match with_place(&spec, place) {
                Ok(n) => n,
                Err(e) => {
                    ui.ctx.set_error(hook, sentence(&e));
                    return false;
                }
            }
        } else {
            ClearSkySpec { place, ..spec }
        };
        ui.apply(hook, next)
    });
    number_field(ui.ctx, field, commit, None)
}

/// The controls of the clear-sky source, with the sun's figures at the slider's time.
pub fn place_controls(ui: PlaceUi) -> impl IntoView {
    let ctx = ui.ctx;
    let lat = place_number(
        ui,
        PlaceField {
            label: "Latitude",
            unit: "°N",
            hook: Control::PlaceLat,
            hint: "Degrees north of the equator; south is negative (−90 to 90).".into(),
            example: "45",
            get: |p| p.lat_deg,
            put: |p, v| p.lat_deg = v,
            moves_clock: false,
        },
    );
    let lon = place_number(
        ui,
        PlaceField {
            label: "Longitude",
            unit: "°E",
            hook: Control::PlaceLon,
            hint: "Degrees east of Greenwich; west is negative (−180 to 180). The clock is local mean time, UTC offset round(longitude / 15) h.".into(),
            example: "7",
            get: |p| p.lon_deg,
            put: |p, v| p.lon_deg = v,
            moves_clock: true,
        },
    );
    let on_example = move |ev: ev::Event| {
        let key = event_target_value(&ev);
        if let Some(x) = EXAMPLES.iter().find(|x| x.key == key) {
            let spec = ui.spec.get_untracked();
            if let Ok(next) = with_place(&spec, x.apply(&spec.place)) {
                ui.apply(Control::PlaceExample, next);
            }
        }
        if let Some(t) = ev.target() {
            use wasm_bindgen::JsCast;
            if let Ok(sel) = t.dyn_into::<web_sys::HtmlSelectElement>() {
                sel.set_value("");
            }
        }
    };
    let examples = EXAMPLES.iter().map(|x| view! { <option value=x.key>{x.label}</option> }).collect_view();

    let date = Memo::new(move |_| ui.spec.with(|s| date_text(s).unwrap_or_default()));
    let on_date = move |ev: ev::Event| {
        let text = event_target_value(&ev);
        match with_date(&ui.spec.get_untracked(), &text) {
            Ok(next) => {
                ui.apply(Control::PlaceDate, next);
            }
            Err(e) => ctx.set_error(Control::PlaceDate, sentence(&e)),
        }
    };

    let on_slide = move |ev: ev::Event| {
        mark("gg-edit");
        let m: u32 = event_target_value(&ev).parse().unwrap_or(720);
        ui.slider.set(m);
        if let Ok(next) = with_minutes(&ui.spec.get_untracked(), m) {
            ui.apply(Control::PlaceTime, next);
        }
    };
    let offset = Memo::new(move |_| {
        ui.spec.with(|s| s.when().map(|t| crate::view::place::offset_text(t.utc_offset_h)).unwrap_or_default())
    });
    let slider_text = move || {
        let m = ui.slider.get();
        format!("{:02}:{:02} (UTC{})", m / 60, m % 60, offset.get())
    };

    let tilt = place_number(
        ui,
        PlaceField {
            label: "Tilt",
            unit: "°",
            hook: Control::PlaceTilt,
            hint: "The plane's angle from horizontal: 0 flat, 90 a wall.".into(),
            example: "30",
            get: |p| p.tilt_deg,
            put: |p, v| p.tilt_deg = v,
            moves_clock: false,
        },
    );
    let azimuth = place_number(
        ui,
        PlaceField {
            label: "Azimuth",
            unit: "°",
            hook: Control::PlaceAzimuth,
            hint: "The way the plane faces, clockwise from north: 90 east, 180 south-facing, 270 west.".into(),
            example: "180",
            get: |p| p.azimuth_deg,
            put: |p, v| p.azimuth_deg = v,
            moves_clock: false,
        },
    );
    let elevation = place_number(
        ui,
        PlaceField {
            label: "Elevation",
            unit: "m",
            hook: Control::PlaceElevation,
            hint: atmosphere_hint("elevation").into(),
            example: "1000",
            get: |p| p.elevation_m,
            put: |p, v| p.elevation_m = v,
            moves_clock: false,
        },
    );
    let pwv = place_number(
        ui,
        PlaceField {
            label: "Precipitable water",
            unit: "cm",
            hook: Control::PlacePwv,
            hint: atmosphere_hint("pwv").into(),
            example: "1.4",
            get: |p| p.pwv_cm,
            put: |p, v| p.pwv_cm = v,
            moves_clock: false,
        },
    );
    let ozone = place_number(
        ui,
        PlaceField {
            label: "Ozone",
            unit: "atm-cm",
            hook: Control::PlaceOzone,
            hint: atmosphere_hint("ozone").into(),
            example: "0.3",
            get: |p| p.ozone_atm_cm,
            put: |p, v| p.ozone_atm_cm = v,
            moves_clock: false,
        },
    );
    let aod = place_number(
        ui,
        PlaceField {
            label: "Aerosol optical depth at 500 nm",
            unit: "",
            hook: Control::PlaceAod,
            hint: atmosphere_hint("aod500").into(),
            example: "0.1",
            get: |p| p.aod500,
            put: |p, v| p.aod500 = v,
            moves_clock: false,
        },
    );
    let angstrom = place_number(
        ui,
        PlaceField {
            label: "Angstrom exponent",
            unit: "",
            hook: Control::PlaceAngstrom,
            hint: atmosphere_hint("angstrom").into(),
            example: "1.14",
            get: |p| p.angstrom,
            put: |p, v| p.angstrom = v,
            moves_clock: false,
        },
    );
    let albedo = place_number(
        ui,
        PlaceField {
            label: "Ground albedo",
            unit: "0–1",
            hook: Control::PlaceAlbedo,
            hint: atmosphere_hint("albedo").into(),
            example: "0.2",
            get: |p| p.albedo,
            put: |p, v| p.albedo = v,
            moves_clock: false,
        },
    );
    let sky = Memo::new(move |_| ui.spec.with(|s| s.place.sky_model));
    let on_sky = move |ev: ev::Event| {
        if let Ok(choice) = SkyChoice::parse(&event_target_value(&ev)) {
            let spec = ui.spec.get_untracked();
            let place = PlaceSpec { sky_model: choice, ..spec.place.clone() };
            ui.apply(Control::PlaceSky, ClearSkySpec { place, ..spec });
        }
    };

    let figures = Memo::new(move |_| ui.spec.with(sun_figures));
    let day_line = move || {
        figures.with(|f| match f {
            Ok(f) => match &f.day {
                DayText::RiseAndSet { sunrise, noon, sunset, .. } => {
                    format!("Sunrise {sunrise} · solar noon {noon} · sunset {sunset}")
                }
                DayText::PolarDay { noon } => format!("The sun does not set · solar noon {noon}"),
                DayText::PolarNight { noon } => format!("The sun does not rise · solar noon {noon}"),
            },
            Err(e) => sentence(e),
        })
    };
    let sun_line = move || {
        figures.with(|f| {
            f.as_ref().ok().map(|f| {
                format!(
                    "At {}: sun's zenith {}°, azimuth {}° · on the plane {} W/m²",
                    f.at,
                    fmt::fixed(f.zenith_deg, 1),
                    fmt::fixed(f.azimuth_deg, 1),
                    fmt::fixed(f.plane_w_m2, 0)
                )
            })
        })
    };

    view! {
        <div class="place" data-block="place">
            <div class="place-pair">{lat}{lon}</div>
            <div class="field">
                <label for="f-place-example">"Example sites"</label>
                <select id="f-place-example" data-control=Control::PlaceExample.as_str() on:change=on_example aria-describedby="e-place-example">
                    <option value="" selected>"Choose an example site…"</option>
                    {examples}
                </select>
                <p class="field-error" id="e-place-example" data-error=Control::PlaceExample.as_str() aria-live="polite">{move || ctx.error_of(Control::PlaceExample)}</p>
            </div>
            <div class="field">
                <label for="f-place-date">"Date"</label>
                <input id="f-place-date" type="date" data-control=Control::PlaceDate.as_str() prop:value=move || date.get() on:change=on_date aria-describedby="e-place-date" />
                <p class="field-error" id="e-place-date" data-error=Control::PlaceDate.as_str() aria-live="polite">{move || ctx.error_of(Control::PlaceDate)}</p>
            </div>
            <div class="field">
                <label for="f-place-time">"Time of day " <output class="muted" data-readout="place-time">{slider_text}</output></label>
                <input
                    id="f-place-time"
                    type="range"
                    min="0"
                    max=SLIDER_MAX_MIN.to_string()
                    step=DAY_STEP_MIN.to_string()
                    data-control=Control::PlaceTime.as_str()
                    aria-describedby="h-place-time e-place-time"
                    aria-valuetext=slider_text
                    prop:value=move || ui.slider.get().to_string()
                    on:input=on_slide
                />
                <p class="hint" id="h-place-time">"Minutes from local midnight, 5-minute steps; arrow keys move it."</p>
                <p class="place-dark" role="status" data-notice="place-dark" hidden=move || ui.dark.with(Option::is_none)>{move || ui.dark.get()}</p>
                <p class="field-error" id="e-place-time" data-error=Control::PlaceTime.as_str() aria-live="polite">{move || ctx.error_of(Control::PlaceTime)}</p>
            </div>
            <div class="place-sun" data-block="place-sun" aria-live="polite">
                <p class="place-tag">"Clear sky, no clouds"</p>
                <p data-readout="place-day">{day_line}</p>
                <p data-readout="place-sun">{sun_line}</p>
            </div>
            <div class="place-pair">{tilt}{azimuth}</div>
            <details class="place-air">
                <summary>"Atmosphere"</summary>
                {elevation}
                {pwv}
                {ozone}
                {aod}
                {angstrom}
                {albedo}
                <div class="field">
                    <label for="f-place-sky-model">"Sky model"</label>
                    <select id="f-place-sky-model" data-control=Control::PlaceSky.as_str() on:change=on_sky aria-describedby="h-place-sky-model e-place-sky-model">
                        <option value="isotropic" prop:selected=move || sky.get() == SkyChoice::Isotropic>"Isotropic"</option>
                        <option value="hay-davies" prop:selected=move || sky.get() == SkyChoice::HayDavies>"Hay-Davies (brighter near the sun)"</option>
                    </select>
                    <p class="hint" id="h-place-sky-model">{atmosphere_hint("sky-model")}</p>
                    <p class="field-error" id="e-place-sky-model" data-error=Control::PlaceSky.as_str() aria-live="polite">{move || ctx.error_of(Control::PlaceSky)}</p>
                </div>
            </details>
            <p class="hint">"Working on a roof or with tracking frames: follow local codes and licensed practice."</p>
        </div>
    }
}

/// The day chart: `plot`'s lines through the day, a marker at the slider's time, a read-out
/// under the pointer (and otherwise at the marker) and the day's totals.
pub fn day_chart(
    ui: PlaceUi,
    plot: Signal<Option<Result<Arc<DayPlot>, String>>>,
    title: &'static str,
) -> impl IntoView {
    let hover = RwSignal::new(None::<usize>);
    let body = Memo::new(move |_| plot.with(|p| p.as_ref().and_then(|r| r.as_ref().ok()).map(|p| svg_body(p))));
    let step_h = Memo::new(move |_| {
        plot.with(|p| {
            p.as_ref()
                .and_then(|r| r.as_ref().ok())
                .and_then(|p| (p.hours.len() > 1).then(|| p.hours[1] - p.hours[0]))
                .unwrap_or(DAY_STEP_MIN as f64 / 60.0)
        })
    });
    let legend = move || {
        plot.with(|p| {
            p.as_ref().and_then(|r| r.as_ref().ok()).map(|p| {
                p.lines
                    .iter()
                    .map(|l| view! { <span class="key"><i class=format!("k-line k-day-{}", l.key)></i>{format!("{} ({})", l.label, l.unit)}</span> })
                    .collect_view()
            })
        })
    };
    let marker_x = move || x_of(ui.slider.get() as f64 / 60.0);
    let readout_at = move |i: usize| plot.with(|p| p.as_ref().and_then(|r| r.as_ref().ok()).and_then(|p| p.readout(i)));
    let readout = move || match hover.get() {
        Some(i) => readout_at(i),
        None => {
            let i = (ui.slider.get() as f64 / 60.0 / step_h.get()).floor() as usize;
            readout_at(i).map(|t| format!("Marker: {t}"))
        }
    };
    let on_move = move |ev: ev::MouseEvent| {
        use wasm_bindgen::JsCast;
        let Some(el) = ev.current_target().and_then(|t| t.dyn_into::<web_sys::Element>().ok()) else { return };
        let r = el.get_bounding_client_rect();
        if r.width() <= 0.0 {
            return;
        }
        let x = (ev.client_x() as f64 - r.left()) / r.width() * W;
        let h = (x - LEFT) / (W - LEFT - RIGHT) * 24.0;
        hover.set((0.0..24.0).contains(&h).then(|| (h / step_h.get_untracked()).floor() as usize));
    };
    let hover_x = move || hover.get().map(|i| x_of(i as f64 * step_h.get())).unwrap_or(-10.0);
    let totals = move || {
        plot.with(|p| match p {
            Some(Ok(p)) => p.totals.clone(),
            Some(Err(e)) => sentence(e),
            None => String::new(),
        })
    };
    view! {
        <section class="plot-card day-card" data-card="day" aria-labelledby="day-h">
            <div class="plot-head"><h3 id="day-h">{title}</h3><span class="muted">"clear sky, no clouds · local clock time"</span></div>
            <div class="legend">{legend}<span class="key"><i class="k-line k-day-marker"></i>"time slider"</span></div>
            <svg
                class="day-chart"
                data-plot="day"
                viewBox=format!("0 0 {W} {H}")
                role="img"
                aria-label=title
                on:mousemove=on_move
                on:mouseleave=move |_| hover.set(None)
            >
                <g inner_html=move || body.get().unwrap_or_default()></g>
                <line class="day-marker" data-marker="time" x1=marker_x x2=marker_x y1=TOP y2=H - BOTTOM />
                <line class="day-hover" x1=hover_x x2=hover_x y1=TOP y2=H - BOTTOM />
            </svg>
            <p class="day-readout" data-readout="day">{readout}</p>
            <p class="day-totals" data-readout="day-totals">{totals}</p>
        </section>
    }
}

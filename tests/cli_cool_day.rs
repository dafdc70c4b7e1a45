//! `glowgap cool --day`: a radiator through a clear day. The command-line contract (JSON,
//! CSV, one-line errors with exit code 2) and checks against outside facts: the energy
//! integral by the rectangle rule over the printed steps, the two-piece cosine air model's
//! extremes (common practice) at the sunrise and solar noon that `glowgap sun` gives, and
//! the sign of the balance for selective and black surfaces.

mod common;
use common::{expect_usage_error, glowgap, json};
use serde_json::Value;

/// An example day of our own: 35 N, 106 W (clock UTC-7), mid-July.
const DAY: &str = "lat=35,lon=-106,date=2024-07-15,tmin=14,tmax=31";

fn steps(v: &Value) -> &Vec<Value> {
    v["steps"].as_array().unwrap()
}

fn f(v: &Value, key: &str) -> f64 {
    v[key].as_f64().unwrap_or_else(|| panic!("{key} in {v}"))
}

/// Minutes of the day of `hh:mm`.
fn minutes(hhmm: &str) -> f64 {
    let (h, m) = hhmm.split_once(':').unwrap();
    h.parse::<f64>().unwrap() * 60.0 + m.parse::<f64>().unwrap()
}

#[test]
fn energy_bookkeeping_and_the_step_clock() {
    let v = json(&["cool", "--day", DAY, "--emitter", "window:8-13", "--hc", "4", "--json"]);
    let s = steps(&v);
    // 24 h in 5-minute steps from local mean-time midnight; the clock is UTC
    // round(-106 / 15) = -7 h (the contract)
    assert_eq!(s.len(), 288);
    assert_eq!(s[0]["time"], "2024-07-15T00:00-07:00");
    assert_eq!(s[287]["time"], "2024-07-15T23:55-07:00");
    // the integral of the net power over the day by the rectangle rule: each step's power
    // times 5 min, in kWh (1 kWh = 3.6e6 J); 1e-9 relative, the same sum in another order
    let sum: f64 = s.iter().map(|x| f(x, "net_w_m2") * 300.0).sum::<f64>() / 3.6e6;
    let got = f(&v, "cooling_kwh_m2");
    assert!((got - sum).abs() <= 1e-9 * sum.abs(), "{got} against {sum}");
    // hours below the air: the count of steps times 5 min
    let below = s.iter().filter(|x| x["steady_temp_k"].as_f64().is_some_and(|t| t < f(x, "ambient_k"))).count();
    assert!((f(&v, "hours_below_ambient") - below as f64 / 12.0).abs() < 1e-12);
    assert!(v["note"].as_str().unwrap().contains("no clouds"));
    // the CSV holds the same steps
    let out = glowgap(&["cool", "--day", DAY, "--emitter", "window:8-13", "--hc", "4", "--csv"]);
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    let mut lines = text.lines().filter(|l| !l.starts_with('#'));
    assert_eq!(lines.next(), Some("time,sun_w_m2,net_w_m2,steady_temp_k,ambient_k"));
    let rows: Vec<&str> = lines.collect();
    assert_eq!(rows.len(), 288);
    let net: f64 = rows.iter().map(|r| r.split(',').nth(2).unwrap().parse::<f64>().unwrap() * 300.0).sum::<f64>();
    assert!((net / 3.6e6 - got).abs() <= 1e-9 * got.abs());
}

#[test]
fn a_selective_emitter_stays_below_the_air_at_night() {
    // An emitter open only in the 8-13 um window under a clear night sky settles below the
    // air temperature (common practice; measured e.g. by Granqvist & Hjortsberg, J. Appl.
    // Phys. 52, 4205 (1981), from memory)
    let v = json(&["cool", "--day", DAY, "--emitter", "window:8-13", "--json"]);
    let night: Vec<&Value> = steps(&v).iter().filter(|x| f(x, "sun_w_m2") == 0.0).collect();
    assert!(night.len() > 80, "a July night at 35 N is longer than 7 h");
    for x in night {
        assert!(f(x, "steady_temp_k") < f(x, "ambient_k"), "{x}");
        assert!(f(x, "net_w_m2") > 0.0, "{x}");
    }
}

#[test]
fn the_air_model_peaks_at_its_stated_times() {
    let v = json(&["cool", "--day", DAY, "--json"]);
    // the day's events from `glowgap sun` on the same clock (UTC-7)
    let sun = json(&["sun", "--lat", "35", "--lon", "-106", "--time", "2024-07-15T12:00-07:00", "--json"]);
    let sunrise = minutes(sun["sunrise"].as_str().unwrap());
    let noon = minutes(sun["solar_noon"].as_str().unwrap());
    let s = steps(&v);
    let at = |x: &Value| minutes(&x["time"].as_str().unwrap()[11..16]);
    let (lo, hi) = s.iter().fold((&s[0], &s[0]), |(lo, hi), x| {
        (
            if f(x, "ambient_k") < f(lo, "ambient_k") { x } else { lo },
            if f(x, "ambient_k") > f(hi, "ambient_k") { x } else { hi },
        )
    });
    // the two-piece cosine (common practice): tmin at sunrise, tmax at 14:00 solar time,
    // i.e. 2 h after solar noon; one 5-minute step of tolerance, plus the minute the clock
    // times are rounded to
    assert!((at(lo) - sunrise).abs() <= 6.0, "minimum at {} against sunrise {sunrise}", at(lo));
    assert!((at(hi) - (noon + 120.0)).abs() <= 6.0, "maximum at {} against {}", at(hi), noon + 120.0);
    // the extremes themselves, within what one step off the exact time can change
    assert!((f(lo, "ambient_k") - (14.0 + 273.15)).abs() < 0.05);
    assert!((f(hi, "ambient_k") - (31.0 + 273.15)).abs() < 0.05);
    assert_eq!(v["air_min_at"], sun["sunrise"]);
    // polar night: solar noon - 6 h stands in for the sunrise (stated in the help)
    let p = json(&["cool", "--day", "lat=78,lon=15,date=2024-12-21", "--sky", "box", "--json"]);
    assert_eq!(p["daylight"], "polar-night");
    assert!(p["sunrise"].is_null());
    let stand_in = minutes(p["solar_noon"].as_str().unwrap()) - 360.0;
    assert!((minutes(p["air_min_at"].as_str().unwrap()) - stand_in).abs() <= 1.0);
    assert!(steps(&p).iter().all(|x| f(x, "sun_w_m2") == 0.0));
}

#[test]
fn a_black_surface_warms_with_the_sun() {
    // A black absorber gains every watt of sunlight, so its steady temperature rises above
    // the air by day and the more the higher the sun (the energy balance, common practice)
    let v = json(&["cool", "--day", DAY, "--hc", "6", "--json"]);
    let s = steps(&v);
    let rise = |x: &Value| f(x, "steady_temp_k") - f(x, "ambient_k");
    let sunniest = s.iter().max_by(|a, b| f(a, "sun_w_m2").total_cmp(&f(b, "sun_w_m2"))).unwrap();
    assert!(f(sunniest, "sun_w_m2") > 800.0, "a July noon at 35 N under a clear sky");
    assert!(rise(sunniest) > 0.0, "{sunniest}");
    for x in s.iter().filter(|x| f(x, "sun_w_m2") == 0.0) {
        assert!(rise(x) < rise(sunniest), "{x}");
    }
    // through the morning the sun climbs and the surface's excess over the air grows
    let morning: Vec<&Value> = s.iter().filter(|x| f(x, "sun_w_m2") > 50.0).take_while(|x| x != &sunniest).collect();
    for w in morning.windows(2) {
        if f(w[1], "sun_w_m2") > f(w[0], "sun_w_m2") + 20.0 {
            assert!(rise(w[1]) > rise(w[0]), "{} then {}", w[0], w[1]);
        }
    }
    // and the net power at the air temperature turns negative (heating) at midday
    assert!(f(sunniest, "net_w_m2") < 0.0);
}

#[test]
fn a_tilted_plane_and_other_place_keys_are_taken() {
    let flat = json(&["cool", "--day", "lat=35,lon=-106,date=2024-12-15", "--sky", "box", "--json"]);
    let tilted = json(&["cool", "--day", "lat=35,lon=-106,date=2024-12-15,tilt=50", "--sky", "box", "--json"]);
    let peak = |v: &Value| steps(v).iter().map(|x| f(x, "sun_w_m2")).fold(0.0, f64::max);
    // a south-facing plane tilted toward the low winter sun receives more at noon than a
    // flat one (common practice)
    assert!(peak(&tilted) > peak(&flat) * 1.2, "{} against {}", peak(&tilted), peak(&flat));
    let dry = json(&["cool", "--day", "lat=35,lon=-106,date=2024-07-15,pwv=0.5", "--json"]);
    assert_eq!(f(&dry, "pwv_cm"), 0.5);
}

#[test]
fn the_day_sun_is_the_sun_command_light_on_the_same_plane() {
    // the same place, plane and moment through `glowgap sun` (whose light is checked in
    // tests/cli_sun.rs against the trapezoid of its spectra and the reference example)
    let v = json(&["cool", "--day", "lat=35,lon=-106,date=2024-07-15,tilt=20,pwv=0.9", "--sky", "box", "--json"]);
    for (i, time) in [(120, "2024-07-15T10:00-07:00"), (180, "2024-07-15T15:00-07:00")] {
        let step = &steps(&v)[i];
        assert_eq!(step["time"], time);
        let sun =
            json(&["sun", "--lat", "35", "--lon", "-106", "--time", time, "--tilt", "20", "--pwv", "0.9", "--json"]);
        let (a, b) = (f(step, "sun_w_m2"), f(&sun, "plane_of_array_w_m2"));
        assert!((a - b).abs() <= 1e-12 * b, "{time}: {a} against {b}");
    }
}

#[test]
fn bad_days_fail_with_one_line() {
    for (day, needle) in [
        ("lat=45,lon=0,date=2023-02-29", "does not exist"),
        ("lat=95,lon=0,date=2024-07-15", "latitude"),
        ("lat=45,lon=0,date=2024-07-15,tmin=30,tmax=20", "tmin"),
        ("lat=45,lon=0,date=2024-07-15,fog=1", "unknown key 'fog'"),
        ("lat=45,lon=0", "date"),
        ("lat=45,lon=0,date=2024-07-15,pwv=-1", "precipitable water"),
    ] {
        expect_usage_error(&["cool", "--day", day], needle);
        expect_usage_error(&["cool", "--day", day], "--day");
    }
    expect_usage_error(&["cool", "--day", DAY, "--sun", "am1.5g"], "--sun");
    expect_usage_error(&["cool", "--day", DAY, "--ambient", "300"], "--ambient");
    expect_usage_error(&["cool", "--day", DAY, "--json", "--csv"], "one of");
    expect_usage_error(&["cool", "--csv"], "--day");
}

#[test]
fn an_hourly_air_file_is_joined_by_straight_lines() {
    let dir = std::env::temp_dir().join(format!("glowgap-day-air-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("air.csv");
    // an example of our own: four values, one given as an ISO time one hour east of the
    // day's clock (14:00 at UTC-6 is 13:00 at UTC-7)
    std::fs::write(&path, "# air by the roof\nhour,air_c\n0,18\n5,14\n2024-07-15T14:00-06:00,31\n18,27\n").unwrap();
    let p = path.to_str().unwrap();
    let v = json(&["cool", "--day", "lat=35,lon=-106,date=2024-07-15", "--day-ambient", p, "--json"]);
    assert_eq!(v["air_model"], "hourly table");
    assert_eq!((f(&v, "tmin_c"), f(&v, "tmax_c")), (14.0, 31.0));
    // linear interpolation between the values, round the clock (the contract), in deg C
    let knots = [(0.0, 18.0), (5.0, 14.0), (13.0, 31.0), (18.0, 27.0), (24.0, 18.0)];
    for x in steps(&v) {
        let h = minutes(&x["time"].as_str().unwrap()[11..16]) / 60.0;
        let k = knots.windows(2).find(|w| h >= w[0].0 && h < w[1].0).unwrap();
        let want = k[0].1 + (k[1].1 - k[0].1) * (h - k[0].0) / (k[1].0 - k[0].0) + 273.15;
        assert!((f(x, "ambient_k") - want).abs() < 1e-9, "{x}: {want}");
    }
    std::fs::write(&path, "0,20\n1,warm\n").unwrap();
    expect_usage_error(&["cool", "--day", "lat=35,lon=-106,date=2024-07-15", "--day-ambient", p], "line 2");
    expect_usage_error(&["cool", "--day", "lat=35,lon=-106,date=2024-07-15,tmin=10", "--day-ambient", p], "tmin");
    expect_usage_error(&["cool", "--day", DAY, "--day-ambient", "/no/such/file"], "--day-ambient");
    expect_usage_error(&["cool", "--day-ambient", p], "--day");
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_day_takes_well_under_a_second_of_work() {
    // 288 balances with the spectral clear sky; the bound is loose because the machine
    // is shared (measured about 0.45-0.5 s of processor time here)
    let start = std::time::Instant::now();
    let out = glowgap(&["cool", "--day", DAY, "--emitter", "window:8-13", "--json"]);
    assert!(out.status.success());
    assert!(start.elapsed().as_secs_f64() < 5.0, "{:?}", start.elapsed());
}

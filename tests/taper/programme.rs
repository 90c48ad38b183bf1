//! The tension programme (taper kind `programme`: tension against diameter, interpolated) from
//! the case file through the solver. Check values are hand-computed from the documented laws:
//! linear interpolation between the programme's points, and the linear taper
//! T(r) = T0·(1 − f·(r − rc)/(R − rc)) (docs/case-format.md). A two-point programme from the
//! core to the outside is that same straight line, so the stresses must agree to rounding.

use rolltriage::case::Case;
use rolltriage::model::{SolverOptions, solve};

/// An invented 2,000-wrap newsprint roll, 100 mm core to 400 mm, web tension 350 N/m at the core,
/// with the `taper:` block given.
fn case_with(taper: &str) -> String {
    format!(
        "title: programme check\n\
         web: {{ preset: newsprint, thickness: 75 um }}\n\
         core: {{ preset: paper_3in, outside_diameter: 100 mm }}\n\
         roll: {{ diameter: 400 mm }}\n\
         winding:\n  method: centre\n{taper}"
    )
}

fn resolve(text: &str) -> rolltriage::case::ResolvedCase {
    Case::from_yaml_str(text, "test.yaml")
        .unwrap()
        .resolve()
        .unwrap()
}

#[test]
fn programme_tension_is_the_hand_interpolation() {
    // Points 100 mm → 350 N/m, 250 mm → 300 N/m, 400 mm → 200 N/m. By hand: at 175 mm diameter
    // half way between the first two, 325 N/m; at 325 mm half way between the last two, 250 N/m.
    let case = resolve(&case_with(
        "  taper:\n    kind: programme\n    points:\n      - { diameter: 100 mm, tension: 350 N/m }\n      - { diameter: 250 mm, tension: 300 N/m }\n      - { diameter: 400 mm, tension: 200 N/m }\n",
    ));
    let schedule = &case.winding.tension;
    let (rc, big_r) = (0.05, 0.2);
    let at = |d: f64| schedule.tension_at(d / 2.0, rc, big_r);
    assert!((at(0.175) - 325.0).abs() < 1e-9, "{}", at(0.175));
    assert!((at(0.325) - 250.0).abs() < 1e-9, "{}", at(0.325));
    assert!((at(0.1) - 350.0).abs() < 1e-12);
    assert!((at(0.4) - 200.0).abs() < 1e-12);
    // The core tension is the programme's, listed as computed (not given, not a preset's).
    assert!((schedule.start_tension - 350.0).abs() < 1e-12);
    let listed = case
        .assumed
        .iter()
        .find(|a| a.field == "winding.tension")
        .expect("winding.tension listed");
    assert!(listed.source.contains("programme"), "{listed:?}");
}

#[test]
fn a_programme_on_the_line_of_a_linear_taper_gives_its_stresses() {
    // Linear taper 30 % from 350 N/m: 245 N/m at the outside (350·(1 − 0.3), by hand). The
    // programme gives the same two end points; a third point on the line at 250 mm diameter,
    // 350·(1 − 0.3·(0.125 − 0.05)/(0.2 − 0.05)) = 297.5 N/m, must change nothing.
    let linear = resolve(&case_with(
        "  tension: 350 N/m\n  taper: { kind: linear, amount: 30 % }\n",
    ));
    let programme = resolve(&case_with(
        "  taper:\n    kind: programme\n    points:\n      - { diameter: 100 mm, tension: 350 N/m }\n      - { diameter: 250 mm, tension: 297.5 N/m }\n      - { diameter: 400 mm, tension: 245 N/m }\n",
    ));
    let options = SolverOptions::default();
    let a = solve(&linear.problem(options)).unwrap();
    let b = solve(&programme.problem(options)).unwrap();
    assert_eq!(a.radius.len(), b.radius.len());
    let peak = a.pressure.iter().fold(0.0_f64, |m, p| m.max(p.abs()));
    for i in 0..a.radius.len() {
        // Tight: the two tension laws differ only by rounding of the interpolation.
        assert!(
            (a.pressure[i] - b.pressure[i]).abs() <= 1e-9 * peak,
            "pressure at node {i}: {} vs {}",
            a.pressure[i],
            b.pressure[i]
        );
        assert!(
            (a.tangential_stress[i] - b.tangential_stress[i]).abs() <= 1e-9 * peak.max(1.0),
            "hoop stress at node {i}"
        );
        assert!((a.wound_in_tension[i] - b.wound_in_tension[i]).abs() <= 1e-9 * 350.0);
    }
}

#[test]
fn programme_mistakes_are_refused_naming_the_field() {
    let both = case_with(
        "  tension: 350 N/m\n  taper:\n    kind: programme\n    points:\n      - { diameter: 100 mm, tension: 350 N/m }\n",
    );
    let error = Case::from_yaml_str(&both, "t.yaml")
        .unwrap()
        .resolve()
        .unwrap_err()
        .to_string();
    assert!(
        error.contains("winding.tension") && error.contains("programme"),
        "{error}"
    );
    let backwards = case_with(
        "  taper:\n    kind: programme\n    points:\n      - { diameter: 300 mm, tension: 350 N/m }\n      - { diameter: 200 mm, tension: 300 N/m }\n",
    );
    let error = Case::from_yaml_str(&backwards, "t.yaml")
        .unwrap()
        .resolve()
        .unwrap_err()
        .to_string();
    assert!(
        error.contains("winding.taper.points[1].diameter"),
        "{error}"
    );
    let empty = case_with("  taper: { kind: programme }\n");
    let error = Case::from_yaml_str(&empty, "t.yaml")
        .unwrap()
        .resolve()
        .unwrap_err()
        .to_string();
    assert!(error.contains("winding.taper.points"), "{error}");
    let wrong_kind = case_with(
        "  taper:\n    kind: linear\n    amount: 10 %\n    points:\n      - { diameter: 100 mm, tension: 350 N/m }\n",
    );
    let error = Case::from_yaml_str(&wrong_kind, "t.yaml")
        .unwrap()
        .resolve()
        .unwrap_err()
        .to_string();
    assert!(error.contains("programme"), "{error}");
}

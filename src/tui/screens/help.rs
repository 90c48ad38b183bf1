//! The help popup: every key, grouped by where it works, and how to read the plots.

/// (section, [(key, what it does)]) — the full list shown by F1.
#[rustfmt::skip]
pub fn sections() -> Vec<(&'static str, Vec<(&'static str, &'static str)>)> {
    vec![
        ("Everywhere", vec![
            ("Tab / Shift-Tab", "next / previous screen"),
            ("F2 F3 F4 F5", "Symptoms / Roll & winding / Results / What-if"),
            ("F1 (? off text)", "this help"),
            ("Ctrl-S", "save the case (asks for a file name the first time)"),
            ("Ctrl-O", "open a case file"),
            ("Ctrl-N", "start a blank case"),
            ("Ctrl-L", "take the inputs from a saved case, keep the symptoms"),
            ("Ctrl-R", "solve again"),
            ("Ctrl-U", "SI / US units"),
            ("Ctrl-E", "export a report (.md, .html or .json by the file name)"),
            ("Ctrl-T / F6", "training walk-throughs: answer a guided case"),
            ("Ctrl-Q (q off text)", "quit — asks when there are unsaved changes"),
        ]),
        ("Symptoms", vec![
            ("type", "search names and the words people use"),
            ("↑ ↓  PgUp PgDn", "move"),
            ("Enter", "pick / unpick the highlighted symptom"),
            ("→ then ↑ ↓", "say where on the roll it shows, answer its questions"),
            ("← →  Enter  y n u", "change the highlighted answer"),
            ("Esc", "clear the search / back to the list"),
        ]),
        ("Roll & winding", vec![
            ("↑ ↓", "move between fields"),
            ("type or Enter", "edit: a number and its unit, e.g. 3 pli, 525 N/m, 48 mil"),
            ("Enter / Esc", "accept (checked at once) / cancel"),
            ("← →", "choose on choice and preset rows"),
            ("Delete", "clear a field: the preset or default value is used"),
            ("Ctrl-K", "fit Pfeiffer K1, K2 to a stack-test CSV"),
        ]),
        ("Results", vec![
            ("← →", "causes / remedies"),
            ("↑ ↓", "move"),
            ("Enter on a cause", "show its reasons: indicator, value, threshold"),
            ("Enter on a remedy", "try it on the What-if screen"),
        ]),
        ("What-if", vec![
            ("↑ ↓", "pick a setting or a remedy"),
            ("← →", "change the setting one step down / up"),
            ("Enter", "try the highlighted remedy"),
            ("d", "design a taper that keeps the roll inside every limit"),
            ("a / r", "keep the change (or the designed taper) in the case / reset"),
        ]),
        ("Training walk-through", vec![
            ("Enter", "start / next question / close after the score"),
            ("1-9, or ↑ ↓ then Enter", "answer the question"),
            ("↑ ↓  PgUp PgDn", "scroll the story and the feedback"),
            ("Esc", "leave the walk-through (its case stays open)"),
        ]),
        ("Reading the plots", vec![
            ("core inner middle outer", "zones of the roll, named on the top row"),
            ("C … S", "core and surface zones when too narrow for the name"),
            ("· and ┆", "every other zone is dotted; ┆ marks a zone boundary"),
            ("═ crush rating", "the core's rated crush pressure (↑ when off the plot)"),
            ("─", "zero"),
            ("⣿ / •", "the curve (after a change) / before the change"),
        ]),
    ]
}

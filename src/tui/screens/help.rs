//! The help popup: every key, grouped by where it works.

/// (section, [(key, what it does)]) — the full key list shown by F1.
pub fn sections() -> Vec<(&'static str, Vec<(&'static str, &'static str)>)> {
    vec![
        (
            "Everywhere",
            vec![
                ("Tab / Shift-Tab", "next / previous screen"),
                (
                    "F2 F3 F4 F5",
                    "Symptoms / Roll & winding / Results / What-if",
                ),
                ("F1 (or ? off text)", "this help"),
                (
                    "Ctrl-S",
                    "save the case (asks for a file name the first time)",
                ),
                ("Ctrl-O", "open a case file"),
                ("Ctrl-N", "start a blank case"),
                (
                    "Ctrl-L",
                    "take the inputs from a saved case, keep the symptoms",
                ),
                ("Ctrl-R", "solve again"),
                ("Ctrl-U", "SI / US units"),
                ("Ctrl-E", "export a report"),
                (
                    "Ctrl-Q (or q off text)",
                    "quit — asks when there are unsaved changes",
                ),
            ],
        ),
        (
            "Symptoms",
            vec![
                ("type", "search names and the words people use"),
                ("↑ ↓  PgUp PgDn", "move"),
                ("Enter", "pick / unpick the highlighted symptom"),
                (
                    "→ then ↑ ↓",
                    "say where on the roll it shows, answer its questions",
                ),
                ("← →  Enter  y n u", "change the highlighted answer"),
                ("Esc", "clear the search / back to the list"),
            ],
        ),
        (
            "Roll & winding",
            vec![
                ("↑ ↓", "move between fields"),
                (
                    "type or Enter",
                    "edit: a number and its unit, e.g. 3 pli, 525 N/m, 48 mil",
                ),
                ("Enter / Esc", "accept (checked at once) / cancel"),
                ("← →", "choose on choice and preset rows"),
                (
                    "Delete",
                    "clear a field: the preset or default value is used",
                ),
            ],
        ),
        (
            "Results",
            vec![
                ("← →", "causes / remedies"),
                ("↑ ↓", "move"),
                (
                    "Enter on a cause",
                    "show its reasons: indicator, value, threshold",
                ),
                ("Enter on a remedy", "try it on the What-if screen"),
            ],
        ),
        (
            "What-if",
            vec![
                ("↑ ↓", "pick a setting or a remedy"),
                ("← →", "change the setting one step down / up"),
                ("Enter", "try the highlighted remedy"),
                ("a / r", "keep the change in the case / reset"),
            ],
        ),
    ]
}

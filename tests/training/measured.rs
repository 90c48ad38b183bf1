//! Issue 17's validation: a shipped walk-through turns on a measurement. Its case carries a
//! `measurements:` section; with it the walk-through's correct cause ranks first, without it
//! the same case does not rank that cause first (the settings alone look normal), and the
//! walk-through's measured figures fill in the trainee's units.

use rolltriage::case::Case;
use rolltriage::diagnose::rules::RuleBase;
use rolltriage::training::{Topic, TrainingContext, fill_placeholders, library, load_case};
use rolltriage::units::UnitSystem;

fn top_cause(context: &TrainingContext) -> Option<String> {
    let diagnosis = context.computed.as_ref()?.diagnosis.as_ref()?;
    diagnosis.causes.first().map(|c| c.id.clone())
}

#[test]
fn a_walkthrough_turns_on_a_measurement() {
    let rules = RuleBase::embedded().unwrap();
    let all = library::embedded().unwrap();
    let measured: Vec<_> = all
        .iter()
        .filter(|l| load_case(l).unwrap().measurements.is_some())
        .collect();
    assert!(!measured.is_empty(), "no walk-through uses a measurement");
    for loaded in measured {
        let w = &loaded.walkthrough;
        let case = load_case(loaded).unwrap();
        let question = w
            .questions
            .iter()
            .find(|q| q.topic == Topic::Cause)
            .unwrap();
        let correct = question.choices[question.correct_choice().unwrap()]
            .cause
            .clone()
            .unwrap();
        let with = TrainingContext::compute(case.clone(), Some(&rules), UnitSystem::Si);
        assert_eq!(
            top_cause(&with).as_deref(),
            Some(correct.as_str()),
            "{}",
            w.id
        );
        let without = TrainingContext::compute(
            Case {
                measurements: None,
                ..case
            },
            Some(&rules),
            UnitSystem::Si,
        );
        assert!(top_cause(&without).is_some(), "{}", w.id);
        assert_ne!(
            top_cause(&without).as_deref(),
            Some(correct.as_str()),
            "{}: the measurement should be what puts the cause first",
            w.id
        );
        // The measured figures fill in, in either unit system (1 in = 25.4 mm, NIST SP 811).
        let text = "{measured_length} on a {measured_diameter} roll; computed {computed_diameter}";
        let si = fill_placeholders(text, with.computed.as_ref(), UnitSystem::Si);
        let us = fill_placeholders(text, with.computed.as_ref(), UnitSystem::Us);
        assert!(!si.contains('{') && !us.contains('{'), "{si} / {us}");
        assert!(si.contains(" mm") && us.contains(" in"), "{si} / {us}");
    }
}

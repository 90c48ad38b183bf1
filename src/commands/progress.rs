//! A progress bar on standard error for the commands that run the triage pipeline; shown only
//! when standard error is a terminal and the work takes a noticeable time.

use std::io::IsTerminal;

/// Run `work` with a progress callback that draws `label` and a bar on standard error.
pub fn with_progress_bar<T>(
    label: &str,
    work: impl FnOnce(rolltriage::diagnose::pipeline::Progress<'_>) -> T,
) -> T {
    if !std::io::stderr().is_terminal() {
        return work(&mut |_| true);
    }
    let bar = indicatif::ProgressBar::new(1000);
    bar.set_style(
        indicatif::ProgressStyle::with_template(&format!(
            "{label} {{bar:40}} {{percent:>3}}% {{elapsed}}"
        ))
        .unwrap_or_else(|_| indicatif::ProgressStyle::default_bar()),
    );
    // Only show the bar for work that takes a noticeable time.
    bar.set_draw_target(indicatif::ProgressDrawTarget::hidden());
    let started = std::time::Instant::now();
    let mut shown = false;
    let result = work(&mut |fraction| {
        if !shown && started.elapsed().as_millis() > 300 {
            bar.set_draw_target(indicatif::ProgressDrawTarget::stderr());
            shown = true;
        }
        bar.set_position((fraction.clamp(0.0, 1.0) * 1000.0) as u64);
        true
    });
    bar.finish_and_clear();
    result
}

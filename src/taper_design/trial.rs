//! One searched schedule (a start tension and a taper solved at the search resolution) and the
//! corrections that carry its values to the verification resolution, so the search can judge
//! every trial by the same limits as the final check.

use crate::case::ResolvedCase;

use super::{Limit, LimitCheck, TaperLimits};

/// One searched schedule, solved at the search resolution.
#[derive(Debug, Clone, Copy)]
pub(super) struct Trial {
    pub start: f64,
    pub fraction: f64,
    /// Values at the search resolution: core pressure (Pa), starring margin, lowest outer
    /// pressure (Pa), largest wound-in tension (N/m).
    pub raw: [f64; 4],
    /// Starring band extent (share of the build).
    pub band: f64,
}

/// Factors that carry search-resolution values to the verification resolution. A grouped solve
/// can be biased on soft webs; the factors are measured where it matters (at the candidate) and
/// the search is repeated with them (output correction).
#[derive(Debug, Clone, Copy)]
pub(super) struct Corrections {
    pub core: f64,
    pub outer: f64,
}

impl Corrections {
    pub const NONE: Corrections = Corrections {
        core: 1.0,
        outer: 1.0,
    };
    pub fn between(search: &[LimitCheck], verified: &[LimitCheck]) -> Corrections {
        let ratio = |limit: Limit| {
            let s = search.iter().find(|c| c.limit == limit).map(|c| c.value);
            let v = verified.iter().find(|c| c.limit == limit).map(|c| c.value);
            match (s, v) {
                (Some(s), Some(v)) if s > 0.0 && v > 0.0 => (v / s).clamp(0.1, 10.0),
                _ => 1.0,
            }
        };
        Corrections {
            core: ratio(Limit::CorePressure),
            outer: ratio(Limit::Telescoping),
        }
    }
}

/// What every trial is judged against: the case and the limits.
#[derive(Clone, Copy)]
pub(super) struct Context<'a> {
    pub case: &'a ResolvedCase,
    pub limits: &'a TaperLimits,
}

impl Trial {
    pub fn from_checks(start: f64, fraction: f64, checks: &[LimitCheck]) -> Trial {
        let mut t = Trial {
            start,
            fraction,
            raw: [0.0; 4],
            band: 0.0,
        };
        for c in checks {
            t.raw[c.limit.index()] = if c.limit == Limit::Starring {
                t.band = c.value;
                c.margin
            } else {
                c.value
            };
        }
        t
    }
    /// Corrected values (starring: band extent).
    pub fn values(&self, k: Corrections) -> [f64; 4] {
        [
            self.raw[0] * k.core,
            self.band,
            self.raw[2] * k.outer,
            self.raw[3],
        ]
    }
    /// Corrected margins, same definitions as [`super::check_limits`].
    pub fn margins(&self, k: Corrections, cx: &Context) -> [f64; 4] {
        let v = self.values(k);
        let outer = v[2] / cx.limits.min_telescoping_margin - 1.0;
        [
            1.0 - v[0] / (cx.limits.core_share * cx.case.core.crush_pressure),
            self.raw[1],
            outer,
            1.0 - v[3] / (cx.limits.tension_share * cx.case.web.strength),
        ]
    }
    pub fn worst(&self, k: Corrections, cx: &Context) -> f64 {
        self.margins(k, cx)
            .iter()
            .cloned()
            .fold(f64::INFINITY, f64::min)
    }
}

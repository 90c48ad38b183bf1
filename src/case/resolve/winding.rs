//! Resolve the roll (diameter and wound length) and the winding settings: method, tension,
//! taper, upsets, nip load, speed.

use crate::model::schedule::TensionStep;
use crate::model::{Taper, TensionSchedule, UpsetBand, WindingMethod};
use crate::presets;
use crate::units::QuantityKind;
use crate::vocabulary::TaperKind;

use super::super::registry::{self as reg, MAX_LAYERS, Range};
use super::super::{
    CaseError, QuantityText, ResolvedCore, ResolvedRoll, ResolvedWeb, ResolvedWinding, RollInput,
    TaperInput, WindingInput,
};
use super::Resolver;

impl Resolver {
    pub(super) fn roll(
        &mut self,
        roll: &RollInput,
        web: &ResolvedWeb,
        core: &ResolvedCore,
    ) -> Result<ResolvedRoll, CaseError> {
        let core_radius = core.outside_diameter / 2.0;
        let h = web.thickness;
        let length_range = reg::ROLL_LENGTH.range();
        let diameter_range = reg::ROLL_DIAMETER.range();
        // The accretion model needs a caliper smaller than the core radius.
        if h >= core_radius {
            return Err(self.out_of_range(
                reg::WEB_THICKNESS.path,
                reg::WEB_THICKNESS.range().show(h),
                format!(
                    "less than the core outside radius {}",
                    reg::CORE_OUTSIDE.range().show(core_radius)
                ),
            ));
        }
        let diameter = self.quantity(
            reg::ROLL_DIAMETER.path,
            roll.diameter.as_ref(),
            QuantityKind::Length,
        )?;
        let length = self.quantity(
            reg::ROLL_LENGTH.path,
            roll.length.as_ref(),
            QuantityKind::Length,
        )?;
        // Wound length of an ideal stack: L = π·(R² − rc²)/h; one wrap (R = rc + h) is
        // π·(2·rc + h).
        let length_of =
            |d: f64| std::f64::consts::PI * ((d / 2.0).powi(2) - core_radius.powi(2)) / h;
        let one_wrap = std::f64::consts::PI * (2.0 * core_radius + h);
        let length = match length {
            Some(l) => Some(self.at_least_one_wrap(l, one_wrap)?),
            None => None,
        };
        let (diameter, length) = match (diameter, length) {
            (Some(d), given_length) => {
                let d = self.given_roll_diameter(d, core, h)?;
                // The length derived from a given diameter is informational (the model works
                // on radii); it is listed as computed so no report calls it given.
                let length = match given_length {
                    Some(l) => l,
                    None => self.computed_length(length_of(d)),
                };
                (d, length)
            }
            (None, Some(l)) => {
                let d = 2.0 * (core_radius.powi(2) + l * h / std::f64::consts::PI).sqrt();
                self.computed(
                    reg::ROLL_DIAMETER.path,
                    diameter_range.show(d),
                    "computed from the length and the caliper: R = √(rc² + L·h/π)",
                );
                if !diameter_range.contains(d) {
                    // Name the field the user wrote, not the one derived from it.
                    return Err(self.out_of_range(
                        reg::ROLL_LENGTH.path,
                        length_range.show(l),
                        format!(
                            "a length that gives a roll diameter {} ({} with this core and caliper)",
                            diameter_range.describe(),
                            diameter_range.show(d)
                        ),
                    ));
                }
                (d, l)
            }
            (None, None) => {
                let fallback = presets::DEFAULT_ROLL_DIAMETER;
                if fallback.value < core.outside_diameter + 2.0 * h {
                    return Err(self.invalid(
                        "roll.diameter is needed: the core is larger than the default roll",
                    ));
                }
                let d = self.assumed(reg::ROLL_DIAMETER.path, &diameter_range, fallback, "");
                (d, self.computed_length(length_of(d)))
            }
        };
        self.at_most_max_layers(
            roll,
            (diameter / 2.0 - core_radius) / h,
            diameter,
            length,
            h,
        )?;
        Ok(ResolvedRoll {
            outer_diameter: diameter,
            length,
        })
    }

    /// A given roll diameter: in range and at least one layer of caliper `h` over the core.
    fn given_roll_diameter(
        &mut self,
        d: f64,
        core: &ResolvedCore,
        h: f64,
    ) -> Result<f64, CaseError> {
        let diameter_range = reg::ROLL_DIAMETER.range();
        let d = self.check(reg::ROLL_DIAMETER.path, d, &diameter_range)?;
        self.note_preset_copy(&reg::ROLL_DIAMETER, d);
        if d <= core.outside_diameter {
            return Err(self.out_of_range(
                reg::ROLL_DIAMETER.path,
                diameter_range.show(d),
                format!(
                    "larger than the core outside diameter {} (the core is bigger than the roll)",
                    reg::CORE_OUTSIDE.range().show(core.outside_diameter)
                ),
            ));
        }
        if d < core.outside_diameter + 2.0 * h {
            return Err(self.out_of_range(
                reg::ROLL_DIAMETER.path,
                diameter_range.show(d),
                format!(
                    "at least one layer over the core: {} or more",
                    diameter_range.show(core.outside_diameter + 2.0 * h)
                ),
            ));
        }
        Ok(d)
    }

    /// A wound length computed from the diameters, recorded as computed.
    fn computed_length(&mut self, length: f64) -> f64 {
        self.computed(
            reg::ROLL_LENGTH.path,
            reg::ROLL_LENGTH.range().show(length),
            "computed from the diameters and the caliper: L = π(R² − rc²)/h",
        );
        length
    }

    /// A given wound length: in range and at least one wrap around the core.
    fn at_least_one_wrap(&self, length: f64, one_wrap: f64) -> Result<f64, CaseError> {
        let range = reg::ROLL_LENGTH.range();
        let length = self.check(reg::ROLL_LENGTH.path, length, &range)?;
        if length < one_wrap {
            return Err(self.out_of_range(
                reg::ROLL_LENGTH.path,
                range.show(length),
                format!(
                    "at least one wrap around the core ({})",
                    range.show(one_wrap)
                ),
            ));
        }
        Ok(length)
    }

    /// At most [`MAX_LAYERS`] layers, naming the field the user wrote: the length when the
    /// diameter came from it.
    fn at_most_max_layers(
        &self,
        roll: &RollInput,
        layers: f64,
        diameter: f64,
        length: f64,
        h: f64,
    ) -> Result<(), CaseError> {
        if layers <= MAX_LAYERS {
            return Ok(());
        }
        let (field, given) = match (roll.diameter.is_some(), roll.length.is_some()) {
            (false, true) => (reg::ROLL_LENGTH.path, reg::ROLL_LENGTH.range().show(length)),
            _ => (
                reg::ROLL_DIAMETER.path,
                reg::ROLL_DIAMETER.range().show(diameter),
            ),
        };
        Err(self.out_of_range(
            field,
            given,
            format!(
                "a build of at most {MAX_LAYERS:e} layers of this caliper ({} would be {layers:.3e} layers)",
                reg::WEB_THICKNESS.range().show(h)
            ),
        ))
    }

    /// A diameter inside the wound part of the roll, returned as a radius.
    pub(super) fn radius_in_roll(
        &self,
        field: &str,
        value: &QuantityText,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
    ) -> Result<f64, CaseError> {
        let d = self
            .quantity(field, Some(value), QuantityKind::Length)?
            .unwrap_or(f64::NAN);
        let range = reg::from(
            core.outside_diameter,
            roll.outer_diameter,
            QuantityKind::Length,
        );
        Ok(self.check(field, d, &range)? / 2.0)
    }

    /// Read a list whose entries each start at a diameter, from the core outward: `diameter`
    /// gives an entry's diameter key and text, `value` reads the rest of the entry given its
    /// field path. The entries as (radius, value), in order; the first bad entry's error.
    pub(super) fn read_outward<T, V>(
        &mut self,
        mut list: OutwardList,
        entries: &[T],
        diameter: impl Fn(&T) -> (&'static str, &QuantityText),
        mut value: impl FnMut(&mut Self, &str, &T) -> Result<V, CaseError>,
    ) -> Result<Vec<(f64, V)>, CaseError> {
        let mut out = Vec::with_capacity(entries.len());
        for entry in entries {
            let (key, text) = diameter(entry);
            let (field, radius) = self.next_outward(&mut list, key, text)?;
            out.push((radius, value(self, &field, entry)?));
        }
        Ok(out)
    }

    /// The next entry of a list that goes from the core outward: its field path
    /// (`winding.taper.steps[2]`) and the radius of its diameter (written under `key`), which
    /// must lie inside the wound part of the roll and above the entry before it.
    fn next_outward(
        &self,
        list: &mut OutwardList,
        key: &str,
        value: &QuantityText,
    ) -> Result<(String, f64), CaseError> {
        let field = format!("{}[{}]", list.path, list.count);
        let diameter_field = format!("{field}.{key}");
        let radius = self.radius_in_roll(&diameter_field, value, list.core, list.roll)?;
        if let Some(last) = list.last
            && radius <= last
        {
            let what = list.what;
            return Err(self.out_of_range(
                &diameter_field,
                reg::CORE_OUTSIDE.range().show(2.0 * radius),
                format!(
                    "larger than the previous {what}'s diameter {} (list {what}s from the core outward)",
                    reg::CORE_OUTSIDE.range().show(2.0 * last)
                ),
            ));
        }
        list.last = Some(radius);
        list.count += 1;
        Ok((field, radius))
    }

    fn tension_below_strength(
        &self,
        field: &str,
        value: f64,
        web: &ResolvedWeb,
        range: &Range,
    ) -> Result<f64, CaseError> {
        let value = self.check(field, value, range)?;
        if value >= web.strength {
            return Err(self.out_of_range(
                field,
                range.show(value),
                format!(
                    "less than the web strength {} (the web would break)",
                    reg::STRENGTH.range().show(web.strength)
                ),
            ));
        }
        Ok(value)
    }

    /// The `tension` of a listed band (a taper step or an upset) at `{field}.tension`: a
    /// required force per width, in `range` and below the web strength.
    fn band_tension(
        &mut self,
        field: &str,
        text: &QuantityText,
        web: &ResolvedWeb,
        range: &Range,
    ) -> Result<f64, CaseError> {
        let field = format!("{field}.tension");
        let tension = self
            .tension_quantity(&field, Some(text), web)?
            .unwrap_or(f64::NAN);
        self.tension_below_strength(&field, tension, web, range)
    }

    pub(super) fn winding(
        &mut self,
        winding: &WindingInput,
        web: &ResolvedWeb,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
    ) -> Result<ResolvedWinding, CaseError> {
        let method = match &winding.method {
            Some(m) => self.word(
                &reg::METHOD,
                "winding method",
                m,
                WindingMethod::from_id,
                crate::vocabulary::WINDING_METHOD_IDS,
            )?,
            None => {
                self.assume(
                    reg::METHOD.path,
                    "centre".to_string(),
                    "",
                    "default: centre winding",
                );
                WindingMethod::Centre
            }
        };
        let preset_id = web.preset.clone().unwrap_or_default();
        let typical = presets::web_preset(&preset_id)
            .map(|p| p.typical_tension)
            .unwrap_or(presets::web_presets()[0].typical_tension);
        // A tension programme gives the tension at every diameter, the core included.
        if let Some(points) = self.programme_taper(winding, web, core, roll)? {
            return self.winding_with(method, winding, web, core, roll, points);
        }
        let start_tension =
            match self.tension_quantity(reg::TENSION.path, winding.tension.as_ref(), web)? {
                Some(t) => {
                    if let Some(named) = self.named_web
                        && (t - named.typical_tension.value).abs()
                            <= super::PRESET_COPY_TOLERANCE * named.typical_tension.value
                    {
                        self.push_assumed(
                            reg::TENSION.path,
                            reg::TENSION.range().show(t),
                            &format!("preset {}", named.id),
                            named.typical_tension.source,
                            crate::case::ValueOrigin::Preset,
                        );
                    }
                    t
                }
                None => {
                    self.assume(
                        reg::TENSION.path,
                        reg::TENSION.range().show(typical.value),
                        &format!("preset {preset_id}"),
                        typical.source,
                    );
                    typical.value
                }
            };
        let start_tension = self.tension_below_strength(
            reg::TENSION.path,
            start_tension,
            web,
            &reg::TENSION.range(),
        )?;
        let taper = match &winding.taper {
            None => {
                self.assume(
                    reg::TAPER_KIND.path,
                    "none".to_string(),
                    "",
                    "default: constant tension",
                );
                Taper::None
            }
            Some(taper) => self.taper(taper, web, core, roll)?,
        };
        let schedule = TensionSchedule {
            start_tension,
            taper,
            upsets: Vec::new(),
        };
        self.winding_with(method, winding, web, core, roll, schedule)
    }

    /// The tension programme of a `programme` taper as a schedule whose start tension is the
    /// programme's tension at the core (listed as computed); `None` for any other taper. A
    /// `winding.tension` given beside the programme is refused (the programme says it).
    fn programme_taper(
        &mut self,
        winding: &WindingInput,
        web: &ResolvedWeb,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
    ) -> Result<Option<TensionSchedule>, CaseError> {
        let Some(taper) = winding
            .taper
            .as_ref()
            .filter(|t| TaperKind::from_id(&t.kind) == Some(TaperKind::Programme))
        else {
            return Ok(None);
        };
        if winding.tension.is_some() {
            return Err(self.invalid(
                "winding.tension and a tension programme (winding.taper.kind `programme`) are both given; keep one (the programme gives the tension at each diameter, the core included)",
            ));
        }
        let taper = self.taper(taper, web, core, roll)?;
        let core_radius = core.outside_diameter / 2.0;
        let mut schedule = TensionSchedule {
            start_tension: 0.0,
            taper,
            upsets: Vec::new(),
        };
        schedule.start_tension =
            schedule.scheduled_tension_at(core_radius, core_radius, roll.outer_diameter / 2.0);
        self.computed(
            reg::TENSION.path,
            reg::TENSION.range().show(schedule.start_tension),
            "the tension programme's value at the core",
        );
        Ok(Some(schedule))
    }

    /// The rest of the winding settings around a resolved tension schedule (upsets added).
    fn winding_with(
        &mut self,
        method: WindingMethod,
        winding: &WindingInput,
        web: &ResolvedWeb,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
        schedule: TensionSchedule,
    ) -> Result<ResolvedWinding, CaseError> {
        let upsets = self.upsets(winding, web, core, roll)?;
        let winder = self.winder(method, winding, web, core, roll)?;
        let nip_load = match self.quantity(
            reg::NIP.path,
            winding.nip_load.as_ref(),
            QuantityKind::ForcePerWidth,
        )? {
            Some(n) => Some(self.check(reg::NIP.path, n, &reg::NIP.range())?),
            None if winder.nip_programme.is_some() => None,
            None => {
                self.assume(
                    reg::NIP.path,
                    "none".to_string(),
                    "",
                    "default: no nip or rider roll, so no nip-induced tension",
                );
                None
            }
        };
        let speed = self.quantity_or(&reg::SPEED, winding.speed.as_ref(), None, None)?;
        let temperature = match self.quantity(
            reg::TEMPERATURE.path,
            winding.temperature.as_ref(),
            QuantityKind::Temperature,
        )? {
            Some(t) => Some(self.check(reg::TEMPERATURE.path, t, &reg::TEMPERATURE.range())?),
            None => None,
        };
        let acceleration_time = match winding.acceleration_time {
            Some(t) => Some(self.check(reg::ACCELERATION.path, t, &reg::ACCELERATION.range())?),
            None => None,
        };
        let recipe_tension = match self.quantity(
            reg::RECIPE_TENSION.path,
            winding.recipe_tension.as_ref(),
            QuantityKind::ForcePerWidth,
        )? {
            Some(t) => {
                Some(self.check(reg::RECIPE_TENSION.path, t, &reg::RECIPE_TENSION.range())?)
            }
            None => None,
        };
        let time = |field: &super::super::registry::Field, value: Option<f64>| match value {
            Some(t) => self.check(field.path, t, &field.range()).map(Some),
            None => Ok(None),
        };
        let stop_time = time(&reg::STOP_TIME, winding.stop_time)?;
        let emergency_stop_time = time(&reg::EMERGENCY_STOP_TIME, winding.emergency_stop_time)?;
        let unwind_tension = match self.tension_quantity(
            reg::UNWIND_TENSION.path,
            winding.unwind_tension.as_ref(),
            web,
        )? {
            Some(t) => {
                Some(self.check(reg::UNWIND_TENSION.path, t, &reg::UNWIND_TENSION.range())?)
            }
            None => None,
        };
        // Listed as assumed when not given; the mechanics take the same default.
        let shock_given = winding.handling_shock_factor;
        self.number_or(&reg::SHOCK_FACTOR, shock_given, None, None)?;
        self.assume_events(
            acceleration_time,
            stop_time,
            emergency_stop_time,
            unwind_tension,
        );
        Ok(ResolvedWinding {
            handling_shock_factor: shock_given,
            stop_time,
            emergency_stop_time,
            unwind_tension,
            method,
            tension: TensionSchedule { upsets, ..schedule },
            nip_load,
            nip_programme: winder.nip_programme,
            nip_plateau: winder.nip_plateau,
            centre_torque: winder.centre_torque,
            drums: winder.drums,
            speed,
            temperature,
            acceleration_time,
            recipe_tension,
        })
    }

    /// The slip-check events the case leaves out, listed as assumed with the defaults the
    /// mechanics take (`mechanics::Events`, docs/theory.md §5).
    fn assume_events(
        &mut self,
        run_up: Option<f64>,
        stop: Option<f64>,
        emergency: Option<f64>,
        unwind: Option<f64>,
    ) {
        use crate::presets::{DEFAULT_EMERGENCY_STOP_TIME, DEFAULT_RAMP_TIME};
        let seconds = |t: f64| format!("{t} s");
        if run_up.is_none() {
            let value = seconds(DEFAULT_RAMP_TIME.value);
            self.assume(reg::ACCELERATION.path, value, "", DEFAULT_RAMP_TIME.source);
        }
        if stop.is_none() {
            let (value, source) = match run_up {
                Some(t) => (seconds(t), "the run-up time"),
                None => (seconds(DEFAULT_RAMP_TIME.value), DEFAULT_RAMP_TIME.source),
            };
            self.assume(reg::STOP_TIME.path, value, "", source);
        }
        if emergency.is_none() {
            let value = seconds(DEFAULT_EMERGENCY_STOP_TIME.value);
            let source = DEFAULT_EMERGENCY_STOP_TIME.source;
            self.assume(reg::EMERGENCY_STOP_TIME.path, value, "", source);
        }
        if unwind.is_none() {
            let value = "as wound at the outside".to_string();
            let source = "default: the tension the outside was wound at";
            self.assume(reg::UNWIND_TENSION.path, value, "", source);
        }
    }

    fn upsets(
        &mut self,
        winding: &WindingInput,
        web: &ResolvedWeb,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
    ) -> Result<Vec<UpsetBand>, CaseError> {
        let mut upsets = Vec::with_capacity(winding.upsets.len());
        for (index, upset) in winding.upsets.iter().enumerate() {
            let field = format!("winding.upsets[{index}]");
            let from_radius = self.radius_in_roll(
                &format!("{field}.from_diameter"),
                &upset.from_diameter,
                core,
                roll,
            )?;
            let to_radius = self.radius_in_roll(
                &format!("{field}.to_diameter"),
                &upset.to_diameter,
                core,
                roll,
            )?;
            if to_radius <= from_radius {
                return Err(self.out_of_range(
                    &format!("{field}.to_diameter"),
                    reg::CORE_OUTSIDE.range().show(2.0 * to_radius),
                    format!(
                        "larger than from_diameter {}",
                        reg::CORE_OUTSIDE.range().show(2.0 * from_radius)
                    ),
                ));
            }
            let tension =
                self.band_tension(&field, &upset.tension, web, &reg::UPSET_TENSION.range())?;
            upsets.push(UpsetBand {
                from_radius,
                to_radius,
                tension,
            });
        }
        Ok(upsets)
    }

    fn taper(
        &mut self,
        taper: &TaperInput,
        web: &ResolvedWeb,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
    ) -> Result<Taper, CaseError> {
        let kind = self.word(
            &reg::TAPER_KIND,
            "taper kind",
            &taper.kind,
            TaperKind::from_id,
            TaperKind::IDS,
        )?;
        if kind != TaperKind::Steps && !taper.steps.is_empty() {
            return Err(self.invalid(format!(
                "winding.taper.steps are given but winding.taper.kind is `{kind}`; use kind `steps`"
            )));
        }
        if kind != TaperKind::Programme && !taper.points.is_empty() {
            return Err(self.invalid(format!(
                "winding.taper.points are given but winding.taper.kind is `{kind}`; use kind `programme`"
            )));
        }
        let fraction = |this: &mut Self| -> Result<f64, CaseError> {
            let field = reg::TAPER_AMOUNT.path;
            match this.quantity(field, taper.amount.as_ref(), QuantityKind::Percent)? {
                Some(f) => {
                    if f >= 1.0 {
                        return Err(this.out_of_range(
                            field,
                            reg::TAPER_AMOUNT.range().show(f),
                            format!(
                                "{} (a taper cannot take away all of the tension)",
                                reg::TAPER_AMOUNT.range().describe()
                            ),
                        ));
                    }
                    this.check(field, f, &reg::TAPER_AMOUNT.range())
                }
                None => Err(this.invalid(format!(
                    "{field} is required for a {kind} taper, e.g. amount: \"25 %\""
                ))),
            }
        };
        match kind {
            TaperKind::None => {
                if taper.amount.is_some() {
                    return Err(
                        self.invalid("winding.taper.amount is given but the taper kind is `none`")
                    );
                }
                Ok(Taper::None)
            }
            TaperKind::Linear => Ok(Taper::Linear {
                fraction: fraction(self)?,
            }),
            TaperKind::Hyperbolic => Ok(Taper::Hyperbolic {
                fraction: fraction(self)?,
            }),
            TaperKind::Steps => self.steps(taper, web, core, roll),
            TaperKind::Programme => self.programme(taper, web, core, roll),
        }
    }

    /// The points of a tension programme, diameters turned into radii.
    fn programme(
        &mut self,
        taper: &TaperInput,
        web: &ResolvedWeb,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
    ) -> Result<Taper, CaseError> {
        if taper.amount.is_some() {
            return Err(self.invalid(
                "winding.taper.amount is not used by a tension programme; give the tension at each diameter",
            ));
        }
        if taper.points.is_empty() {
            return Err(self.invalid(
                "winding.taper.points is empty; a tension programme needs at least one point",
            ));
        }
        let list = OutwardList::new("winding.taper.points", "point", core, roll);
        let points = self.read_outward(
            list,
            &taper.points,
            |point| ("diameter", &point.diameter),
            |this, field, point| {
                this.band_tension(field, &point.tension, web, &reg::POINT_TENSION.range())
            },
        )?;
        Ok(Taper::Programme {
            points: tension_steps(points),
        })
    }

    /// The steps of a `steps` taper, diameters turned into radii.
    fn steps(
        &mut self,
        taper: &TaperInput,
        web: &ResolvedWeb,
        core: &ResolvedCore,
        roll: &ResolvedRoll,
    ) -> Result<Taper, CaseError> {
        if taper.amount.is_some() {
            return Err(self.invalid(
                "winding.taper.amount is not used by a `steps` taper; give the tension of each step",
            ));
        }
        if taper.steps.is_empty() {
            return Err(self
                .invalid("winding.taper.steps is empty; a `steps` taper needs at least one step"));
        }
        let list = OutwardList::new("winding.taper.steps", "step", core, roll);
        let steps = self.read_outward(
            list,
            &taper.steps,
            |step| ("from_diameter", &step.from_diameter),
            |this, field, step| this.band_tension(field, &step.tension, web, &reg::TENSION.range()),
        )?;
        Ok(Taper::Steps {
            steps: tension_steps(steps),
        })
    }
}

/// A list of entries that each start at a diameter, read from the core outward (taper steps,
/// the tension programme, the nip programme); see [`Resolver::read_outward`].
pub(super) struct OutwardList<'a> {
    /// The list's field path, e.g. `winding.taper.steps`.
    path: &'static str,
    /// What one entry is called in messages ("step", "point").
    what: &'static str,
    core: &'a ResolvedCore,
    roll: &'a ResolvedRoll,
    /// Entries read so far, and the radius of the last one.
    count: usize,
    last: Option<f64>,
}

impl<'a> OutwardList<'a> {
    pub(super) fn new(
        path: &'static str,
        what: &'static str,
        core: &'a ResolvedCore,
        roll: &'a ResolvedRoll,
    ) -> Self {
        OutwardList {
            path,
            what,
            core,
            roll,
            count: 0,
            last: None,
        }
    }
}

/// (radius, tension) pairs as the model's tension steps.
fn tension_steps(entries: Vec<(f64, f64)>) -> Vec<TensionStep> {
    entries
        .into_iter()
        .map(|(radius, tension)| TensionStep { radius, tension })
        .collect()
}

//! The result of a solve: per-node radius, pressure, tangential stress, strain, wound-in tension;
//! the named zones and summary figures, and the queries the diagnosis engine asks of a profile
//! (zone statistics, compressive bands, low-pressure bands).
//!
//! Node 0 is the core surface (its pressure is the pressure on the core); every further node is a
//! wrap (or, in grouped resolution, the first wrap of an element); the last node is the outer
//! surface of the roll, where pressure is zero.

use super::wound_in::AirFilm;
use super::{Grid, SolverStats, WindingProblem};

mod json;

/// Zone names used by rules (see `docs/rules.md`). Cuts are defined in one place, in this module.
#[derive(
    Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, serde::Serialize, serde::Deserialize,
)]
#[serde(rename_all = "snake_case")]
pub enum ZoneName {
    Core,
    Inner,
    Middle,
    Outer,
    Surface,
}

impl ZoneName {
    pub const ALL: [ZoneName; 5] = [
        ZoneName::Core,
        ZoneName::Inner,
        ZoneName::Middle,
        ZoneName::Outer,
        ZoneName::Surface,
    ];
    pub fn as_str(self) -> &'static str {
        match self {
            ZoneName::Core => "core",
            ZoneName::Inner => "inner",
            ZoneName::Middle => "middle",
            ZoneName::Outer => "outer",
            ZoneName::Surface => "surface",
        }
    }
}

/// The default zone cuts, as fractions of the build (0 at the core surface, 1 at the outside).
/// This is the one place they are defined; plots and docs read them from here.
pub mod zone_cuts {
    /// `core`: the first 5 % of the build.
    pub const CORE_END: f64 = 0.05;
    /// `inner`: 5 % to 35 %.
    pub const INNER_END: f64 = 0.35;
    /// `middle`: 35 % to 70 %; `outer` from here to the start of `surface`.
    pub const MIDDLE_END: f64 = 0.70;
    /// `surface`: the outermost wraps whose tangential stress is still tensile, but never deeper
    /// than this share of the build from the outside (always at least the outermost node).
    pub const SURFACE_MAX_DEPTH: f64 = 0.10;
}

/// Share of the peak pressure below which a node counts as "low pressure" in the summary's
/// band figures (the helpers take any threshold).
pub const LOW_PRESSURE_SHARE: f64 = 0.25;

/// A named zone: a contiguous range of nodes `[start, end)` and its radii (m).
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct Zone {
    pub name: ZoneName,
    pub start: usize,
    pub end: usize,
    pub inner_radius: f64,
    pub outer_radius: f64,
}

/// Summary figures of a profile.
#[derive(Debug, Clone, PartialEq, Default, serde::Serialize, serde::Deserialize)]
pub struct ProfileSummary {
    /// Pressure on the core (Pa).
    pub core_pressure: f64,
    pub peak_pressure: f64,
    pub peak_pressure_radius: f64,
    /// Most compressive (lowest) tangential stress (Pa) and where.
    pub min_tangential_stress: f64,
    pub min_tangential_radius: f64,
    /// Physical layers (wraps) of the roll.
    pub physical_layers: usize,
    /// Radial (compressive) strain of the stack at the core (dimensionless).
    #[serde(default)]
    pub core_radial_strain: f64,
    /// Largest band with compressive tangential stress and pressure below
    /// [`LOW_PRESSURE_SHARE`] of the peak (starring risk), if any.
    #[serde(default)]
    pub compressive_low_pressure_band: Option<Band>,
    /// Share (0..1) of the outer zones (`outer` and `surface`) where the pressure is below
    /// [`LOW_PRESSURE_SHARE`] of the peak.
    #[serde(default)]
    pub outer_low_pressure_share: f64,
}

/// A contiguous band of nodes.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct Band {
    pub inner_radius: f64,
    pub outer_radius: f64,
    /// Radial extent as a share of the build (0..1).
    pub fraction_of_build: f64,
    /// Radial extent in wraps (radial extent / caliper).
    pub wraps: f64,
}

/// Minimum, mean and maximum of a quantity over a zone.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct ZoneStats {
    pub min: f64,
    pub mean: f64,
    pub max: f64,
}

/// Stress state of the finished roll, node 0 at the core surface, last node at the outside.
///
/// In JSON the solver's figures sit inside `summary` beside the physics, as they always have
/// (see [`json`]), so saved outputs keep their layout.
#[derive(Debug, Clone, PartialEq, Default, serde::Serialize, serde::Deserialize)]
#[serde(into = "json::ProfileRecord", from = "json::ProfileRecord")]
pub struct Profile {
    /// m
    pub radius: Vec<f64>,
    /// Interlayer pressure, Pa, positive in compression.
    pub pressure: Vec<f64>,
    /// σθ, Pa, positive in tension: the hoop stress of the ring from this node to the next (one
    /// wrap, or one element in grouped resolution), which satisfies the ring's radial statics
    /// σθ·(r_{i+1} − r_i) = r_i·P_i − r_{i+1}·P_{i+1} exactly; the outer surface node repeats the
    /// outermost wrap (docs/theory.md §3.5). The one hoop stress every reader uses.
    pub tangential_stress: Vec<f64>,
    /// Radial strain (compressive positive), dimensionless.
    pub radial_strain: Vec<f64>,
    /// Wound-in tension per unit width at the time the node was wound (N/m).
    pub wound_in_tension: Vec<f64>,
    pub zones: Vec<Zone>,
    pub summary: ProfileSummary,
    /// The grid the solve used and its work (not physics).
    pub solver: SolverStats,
    /// Air-film estimate at the core start and at the outside.
    pub air_film: Option<(AirFilm, AirFilm)>,
    /// Human-readable warnings (e.g. nip load outside the validity of the nip model).
    pub warnings: Vec<String>,
    /// Web caliper (m), for converting radial extents into wraps.
    #[serde(default)]
    pub thickness: f64,
}

/// Raw solver output handed to [`build`].
pub(crate) struct Raw {
    pub radius: Vec<f64>,
    pub pressure: Vec<f64>,
    pub tangential_stress: Vec<f64>,
    pub radial_strain: Vec<f64>,
    pub wound_in_tension: Vec<f64>,
    pub physical_layers: usize,
    pub grid: Grid,
    pub increments: usize,
    pub solves: usize,
    pub air_film: Option<(AirFilm, AirFilm)>,
    pub warnings: Vec<String>,
}

/// Assemble a profile: zones and summary figures.
pub(crate) fn build(raw: Raw, problem: &WindingProblem) -> Profile {
    let elements = raw.radius.len().saturating_sub(1);
    let mut profile = Profile {
        radius: raw.radius,
        pressure: raw.pressure,
        tangential_stress: raw.tangential_stress,
        radial_strain: raw.radial_strain,
        wound_in_tension: raw.wound_in_tension,
        zones: Vec::new(),
        summary: ProfileSummary::default(),
        solver: SolverStats {
            grid: raw.grid,
            elements,
            increments: raw.increments,
            solves: raw.solves,
            group_halving_change: None,
        },
        air_film: raw.air_film,
        warnings: raw.warnings,
        thickness: problem.thickness,
    };
    profile.zones = default_zones(&profile.radius, &profile.tangential_stress);
    let mut summary = ProfileSummary {
        physical_layers: raw.physical_layers,
        ..ProfileSummary::default()
    };
    if let Some(&p) = profile.pressure.first() {
        summary.core_pressure = p;
    }
    if let Some((i, p)) = profile.peak_pressure() {
        summary.peak_pressure = p;
        summary.peak_pressure_radius = profile.radius[i];
    }
    if let Some((s, r)) = profile.most_compressive_tangential() {
        summary.min_tangential_stress = s;
        summary.min_tangential_radius = r;
    }
    summary.core_radial_strain = profile.core_radial_strain();
    let low = LOW_PRESSURE_SHARE * summary.peak_pressure;
    summary.compressive_low_pressure_band = profile.compressive_band(Some(low));
    summary.outer_low_pressure_share =
        profile.low_pressure_share(&[ZoneName::Outer, ZoneName::Surface], low);
    profile.summary = summary;
    profile
}

/// Cut nodes into the default zones (see [`zone_cuts`]).
pub fn default_zones(radius: &[f64], tangential_stress: &[f64]) -> Vec<Zone> {
    let n = radius.len();
    if n == 0 {
        return Vec::new();
    }
    let rc = radius[0];
    let span = (radius[n - 1] - rc).max(f64::MIN_POSITIVE);
    let fraction = |i: usize| (radius[i] - rc) / span;
    let first_at = |cut: f64| (0..n).find(|&i| fraction(i) >= cut).unwrap_or(n);
    // Surface: walk in from the outside while tangential stress is tensile.
    let deepest = first_at(1.0 - zone_cuts::SURFACE_MAX_DEPTH);
    let mut surface_start = n - 1;
    while surface_start > deepest && tangential_stress[surface_start - 1] > 0.0 {
        surface_start -= 1;
    }
    let core_end = first_at(zone_cuts::CORE_END)
        .min(surface_start)
        .max(1.min(n));
    let inner_end = first_at(zone_cuts::INNER_END).clamp(core_end, surface_start);
    let middle_end = first_at(zone_cuts::MIDDLE_END).clamp(inner_end, surface_start);
    let bounds = [
        (ZoneName::Core, 0, core_end),
        (ZoneName::Inner, core_end, inner_end),
        (ZoneName::Middle, inner_end, middle_end),
        (ZoneName::Outer, middle_end, surface_start),
        (ZoneName::Surface, surface_start, n),
    ];
    bounds
        .iter()
        .map(|&(name, start, end)| Zone {
            name,
            start,
            end,
            inner_radius: radius[start.min(n - 1)],
            outer_radius: if end > start {
                radius[end - 1]
            } else {
                radius[start.min(n - 1)]
            },
        })
        .collect()
}

impl Profile {
    pub fn zone(&self, name: ZoneName) -> Option<&Zone> {
        self.zones.iter().find(|z| z.name == name)
    }

    /// Build fraction (0 at the core, 1 at the outside) of node `index`.
    pub fn build_fraction(&self, index: usize) -> f64 {
        match (
            self.radius.first(),
            self.radius.last(),
            self.radius.get(index),
        ) {
            (Some(&rc), Some(&outer), Some(&r)) if outer > rc => (r - rc) / (outer - rc),
            _ => 0.0,
        }
    }

    /// Build fraction of a radius.
    pub fn fraction_at_radius(&self, radius: f64) -> f64 {
        match (self.radius.first(), self.radius.last()) {
            (Some(&rc), Some(&outer)) if outer > rc => {
                ((radius - rc) / (outer - rc)).clamp(0.0, 1.0)
            }
            _ => 0.0,
        }
    }

    fn stats(values: &[f64]) -> Option<ZoneStats> {
        if values.is_empty() {
            return None;
        }
        let mut min = f64::INFINITY;
        let mut max = f64::NEG_INFINITY;
        let mut sum = 0.0;
        for &v in values {
            min = min.min(v);
            max = max.max(v);
            sum += v;
        }
        Some(ZoneStats {
            min,
            mean: sum / values.len() as f64,
            max,
        })
    }

    /// Minimum, mean and maximum interlayer pressure (Pa) in a zone; `None` for an empty zone.
    pub fn zone_pressure(&self, name: ZoneName) -> Option<ZoneStats> {
        let z = self.zone(name)?;
        Self::stats(self.pressure.get(z.start..z.end)?)
    }

    /// Minimum, mean and maximum tangential stress (Pa) in a zone.
    pub fn zone_tangential_stress(&self, name: ZoneName) -> Option<ZoneStats> {
        let z = self.zone(name)?;
        Self::stats(self.tangential_stress.get(z.start..z.end)?)
    }

    /// Peak pressure: (node index, Pa).
    pub fn peak_pressure(&self) -> Option<(usize, f64)> {
        self.pressure
            .iter()
            .copied()
            .enumerate()
            .fold(None, |best, (i, p)| match best {
                Some((_, b)) if b >= p => best,
                _ => Some((i, p)),
            })
    }

    /// Most compressive (lowest) tangential stress: (Pa, radius m).
    pub fn most_compressive_tangential(&self) -> Option<(f64, f64)> {
        self.most_compressive_tangential_in(None)
    }

    /// Most compressive tangential stress within a zone (or the whole roll): (Pa, radius m).
    pub fn most_compressive_tangential_in(&self, zone: Option<ZoneName>) -> Option<(f64, f64)> {
        let (start, end) = match zone {
            Some(name) => {
                let z = self.zone(name)?;
                (z.start, z.end)
            }
            None => (0, self.tangential_stress.len()),
        };
        (start..end.min(self.tangential_stress.len()))
            .map(|i| (self.tangential_stress[i], self.radius[i]))
            .fold(None, |best, (s, r)| match best {
                Some((b, _)) if b <= s => best,
                _ => Some((s, r)),
            })
    }

    fn band_of(&self, start: usize, end: usize) -> Band {
        // A node stands for the radial slice up to the next node.
        let inner = self.radius[start];
        let outer = if end < self.radius.len() {
            self.radius[end]
        } else {
            self.radius[end - 1]
        };
        let span = match (self.radius.first(), self.radius.last()) {
            (Some(&a), Some(&b)) if b > a => b - a,
            _ => 1.0,
        };
        Band {
            inner_radius: inner,
            outer_radius: outer,
            fraction_of_build: (outer - inner) / span,
            wraps: if self.thickness > 0.0 {
                (outer - inner) / self.thickness
            } else {
                0.0
            },
        }
    }

    /// Largest contiguous band with compressive (negative) tangential stress and, when
    /// `pressure_below` is given, pressure below it (Pa). `None` when there is no such node.
    pub fn compressive_band(&self, pressure_below: Option<f64>) -> Option<Band> {
        let hit = |i: usize| {
            self.tangential_stress[i] < 0.0 && pressure_below.is_none_or(|p| self.pressure[i] < p)
        };
        self.largest_run(0, self.radius.len(), hit)
    }

    /// Largest contiguous band inside the given zones with pressure below `pressure_below` (Pa).
    pub fn low_pressure_band(&self, zones: &[ZoneName], pressure_below: f64) -> Option<Band> {
        let mut best: Option<Band> = None;
        for &name in zones {
            if let Some(z) = self.zone(name) {
                let band = self.largest_run(z.start, z.end, |i| self.pressure[i] < pressure_below);
                if let Some(b) = band
                    && best.is_none_or(|x| b.fraction_of_build > x.fraction_of_build)
                {
                    best = Some(b);
                }
            }
        }
        best
    }

    /// Share (0..1) of the nodes of the given zones with pressure below `pressure_below` (Pa).
    pub fn low_pressure_share(&self, zones: &[ZoneName], pressure_below: f64) -> f64 {
        let mut total = 0usize;
        let mut low = 0usize;
        for &name in zones {
            if let Some(z) = self.zone(name) {
                for i in z.start..z.end.min(self.pressure.len()) {
                    total += 1;
                    if self.pressure[i] < pressure_below {
                        low += 1;
                    }
                }
            }
        }
        if total == 0 {
            0.0
        } else {
            low as f64 / total as f64
        }
    }

    fn largest_run(&self, start: usize, end: usize, hit: impl Fn(usize) -> bool) -> Option<Band> {
        let end = end.min(self.radius.len());
        let mut best: Option<(usize, usize)> = None;
        let mut i = start;
        while i < end {
            if hit(i) {
                let s = i;
                while i < end && hit(i) {
                    i += 1;
                }
                let len = self.band_of(s, i).fraction_of_build;
                if best.is_none_or(|(a, b)| len > self.band_of(a, b).fraction_of_build) {
                    best = Some((s, i));
                }
            } else {
                i += 1;
            }
        }
        best.map(|(s, e)| self.band_of(s, e))
    }

    /// Radial (compressive) strain of the stack at the core.
    pub fn core_radial_strain(&self) -> f64 {
        self.radial_strain.first().copied().unwrap_or(0.0)
    }

    /// Linear interpolation of a node quantity at a radius (clamped to the roll).
    pub fn interpolate(values: &[f64], radius: &[f64], at: f64) -> f64 {
        if values.is_empty() {
            return 0.0;
        }
        let k = radius.partition_point(|&r| r < at);
        if k == 0 {
            return values[0];
        }
        if k >= radius.len() {
            return values[values.len() - 1];
        }
        let (r0, r1) = (radius[k - 1], radius[k]);
        let t = if r1 > r0 { (at - r0) / (r1 - r0) } else { 0.0 };
        values[k - 1] + t * (values[k] - values[k - 1])
    }

    /// A copy with at most `max_points` nodes (but never fewer than the key nodes) for plotting: evenly spaced nodes plus
    /// the core, the outside, the peak pressure, the most compressive tangential stress and the
    /// zone boundaries. Zones are remapped; summary and warnings are kept.
    pub fn downsampled(&self, max_points: usize) -> Profile {
        let n = self.radius.len();
        let max_points = max_points.max(2);
        if n <= max_points {
            return self.clone();
        }
        let mut keep: Vec<usize> = vec![0, n - 1];
        if let Some((i, _)) = self.peak_pressure() {
            keep.push(i);
        }
        if let Some(i) =
            (0..n).min_by(|&a, &b| self.tangential_stress[a].total_cmp(&self.tangential_stress[b]))
        {
            keep.push(i);
        }
        for z in &self.zones {
            if z.start < n {
                keep.push(z.start);
            }
        }
        keep.sort_unstable();
        keep.dedup();
        let room = max_points.saturating_sub(keep.len());
        if room > 0 {
            for k in 0..room {
                keep.push(((k as f64 + 0.5) * (n - 1) as f64 / room as f64).round() as usize);
            }
            keep.sort_unstable();
            keep.dedup();
        }
        let pick = |v: &[f64]| keep.iter().map(|&i| v[i]).collect::<Vec<_>>();
        let new_index = |old: usize| keep.partition_point(|&i| i < old);
        let zones = self
            .zones
            .iter()
            .map(|z| Zone {
                start: new_index(z.start),
                end: new_index(z.end),
                ..z.clone()
            })
            .collect();
        Profile {
            radius: pick(&self.radius),
            pressure: pick(&self.pressure),
            tangential_stress: pick(&self.tangential_stress),
            radial_strain: pick(&self.radial_strain),
            wound_in_tension: pick(&self.wound_in_tension),
            zones,
            summary: self.summary.clone(),
            solver: self.solver,
            air_film: self.air_film,
            warnings: self.warnings.clone(),
            thickness: self.thickness,
        }
    }
}

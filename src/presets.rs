//! Generic material and core presets: approximate starting values for what a case file leaves
//! out. Every number carries its source: a named publication, `common practice`, or
//! `(from memory)` (recalled, not checked against a publication — calibrate before trusting).
//!
//! These are generic grades, not any supplier's product. Values are SI (m, Pa, N/m).
//!
//! Pfeiffer's radial law (Pfeiffer, TAPPI J. 49(8):342, 1966) is P = K1·(e^(K2·ε) − 1), so the
//! radial modulus is Er = K2·(P + K1). Published fits vary by a factor of several between
//! grades and test methods; the K1/K2 below give the right order of radial softness for each
//! kind of web and nothing more. Measure a stack (see `rolltriage calibrate`) when it matters.

use serde::Serialize;

use crate::vocabulary::{CoreMaterial, WebMaterial};

/// One preset number with where it came from.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Sourced {
    pub value: f64,
    pub source: &'static str,
}

const fn sourced(value: f64, source: &'static str) -> Sourced {
    Sourced { value, source }
}

/// Source note for values recalled without checking a publication.
const MEMORY: &str = "(from memory)";
/// Pfeiffer constants: order of magnitude only.
const PFEIFFER_MEMORY: &str =
    "(from memory) order of magnitude of published Pfeiffer (1966) fits for this kind of web";
/// Kinetic web-to-web friction of newsprint, measured for wound-in tension work.
const GOOD_1999_KINETIC: &str = "Good, Hartwig & Markum, Proc. 5th Int. Conf. Web Handling (1999): kinetic coefficient 0.19 newsprint on newsprint";
/// Kinetic friction recalled, not checked.
const KINETIC_MEMORY: &str = "(from memory) kinetic web-to-web friction, below the static value as for newsprint (0.19 kinetic against about 0.4 static)";
/// PET film friction from published datasheet ranges.
const PET_FRICTION: &str = "mid-range of PET film datasheets (ASTM D1894 film to film): static 0.35–0.55, kinetic 0.30–0.45";
/// Nonwoven kinetic friction: recalled; measured nip-induced tension on a nonwoven was well
/// below μk·N (Balaji & Good), so the wound-in tension from it is high.
const NONWOVEN_KINETIC: &str = "(from memory); measured nip-induced tension on a polyethylene nonwoven was much less than this × nip load (Balaji & Good)";
/// Tension rule of thumb per mil of caliper for films and foil.
const FILM_TENSION_RULE: &str = "(from memory) trade rule of thumb for this film in pli per mil of caliper; common practice is 10–25 % of tensile strength at most";
/// Tension rule of thumb for paper grades.
const PAPER_TENSION_RULE: &str =
    "(from memory) trade rule of thumb about 0.5 pli per 10 lb of basis weight (3300 ft² ream)";
/// Poisson ratio of the wound stack used by accretion models.
const STACK_POISSON: &str = "(from memory) small value usual in Hakiel-type accretion models; results are insensitive to it";

/// Typical values published by film makers in comparative tables of oriented films
/// (ISO 527-1/-2 at 23 °C, 50 % r.h.): BOPET MD modulus 4500 N/mm² and tensile strength
/// 200 N/mm²; BOPP MD modulus 2500 N/mm² and tensile strength 150 N/mm².
const FILM_TABLE: &str =
    "film makers' published comparative data for oriented films (ISO 527-1/-2, 23 °C)";

/// A generic web kind.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct WebPreset {
    pub id: &'static str,
    pub name: &'static str,
    pub material: WebMaterial,
    /// Caliper of one layer (m).
    pub thickness: Sourced,
    /// Machine-direction (tangential) modulus Eθ (Pa).
    pub tangential_modulus: Sourced,
    /// Pfeiffer K1 (Pa).
    pub k1: Sourced,
    /// Pfeiffer K2 (dimensionless).
    pub k2: Sourced,
    /// Poisson ratio of the wound stack (ν_θr).
    pub poisson_ratio: Sourced,
    /// Static web-to-web friction coefficient (slip checks: cinching, telescoping, core slip).
    pub friction: Sourced,
    /// Kinetic web-to-web friction coefficient (nip-induced tension).
    pub kinetic_friction: Sourced,
    /// Density of the web (kg/m³): roll weight on winder drums, centrifugal unloading.
    pub density: Sourced,
    /// RMS roughness of one surface (m).
    pub roughness: Sourced,
    /// Machine-direction tensile strength per width (N/m).
    pub strength: Sourced,
    /// Typical winding tension per width (N/m).
    pub typical_tension: Sourced,
}

/// A generic core kind.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct CorePreset {
    pub id: &'static str,
    pub name: &'static str,
    pub material: CoreMaterial,
    /// Bore (m).
    pub inside_diameter: Sourced,
    /// Outside diameter where winding starts (m).
    pub outside_diameter: Sourced,
    /// Hoop (tangential) modulus of the core wall (Pa); the modulus of isotropic cores.
    pub modulus: Sourced,
    /// Radial (through-the-wall) modulus (Pa); equal to `modulus` for isotropic cores, far
    /// below it for spiral-wound paper cores (Gerhardt 1990).
    pub radial_modulus: Sourced,
    pub poisson_ratio: Sourced,
    /// Hoop compressive stress the wall carries (Pa), for the crush estimate.
    pub compressive_strength: Sourced,
    /// Interlayer pressure on the core it is estimated to carry before crushing (Pa), free
    /// core: `model::core_crush::estimated_limit` from the values above (a test keeps the two
    /// in step). A supplier's rating replaces it in a case.
    pub crush_pressure: Sourced,
}

const INCH: f64 = 0.0254;
const PLI: f64 = 4.448_221_615_260_5 / INCH;

/// Newsprint: also the base of the engine's soft reference web, which differs only in the
/// sources of its caliper and Pfeiffer constants.
const NEWSPRINT: WebPreset = WebPreset {
    id: "newsprint",
    name: "Newsprint-like paper (about 45 g/m²)",
    material: WebMaterial::Paper,
    thickness: sourced(
        76e-6,
        "common practice: newsprint caliper about 3 mil (76 µm)",
    ),
    tangential_modulus: sourced(4.5e9, MEMORY),
    k1: sourced(5e3, PFEIFFER_MEMORY),
    k2: sourced(50.0, PFEIFFER_MEMORY),
    poisson_ratio: sourced(0.01, STACK_POISSON),
    friction: sourced(0.4, "(from memory) paper-to-paper static friction 0.3–0.5"),
    kinetic_friction: sourced(0.19, GOOD_1999_KINETIC),
    density: sourced(590.0, "computed: 45 g/m² over the 76 µm caliper"),
    roughness: sourced(4e-6, "(from memory) uncoated mechanical paper, Rq a few µm"),
    strength: sourced(
        2.3e3,
        "(from memory) MD tensile index about 50 N·m/g at 45 g/m²",
    ),
    typical_tension: sourced(1.5 * PLI, PAPER_TENSION_RULE),
};

/// Source of the engine's reference web values.
const ENGINE_REFERENCE: &str = "rolltriage reference web used by the engine tests";

const WEB_PRESETS: [WebPreset; 9] = [
    NEWSPRINT,
    WebPreset {
        id: "soft_paper_reference",
        name: "Soft paper-like reference web (engine checks; not a measured grade)",
        thickness: sourced(76e-6, ENGINE_REFERENCE),
        k1: sourced(5e3, ENGINE_REFERENCE),
        k2: sourced(50.0, ENGINE_REFERENCE),
        ..NEWSPRINT
    },
    WebPreset {
        id: "coated_paper",
        name: "Coated printing paper (about 90 g/m²)",
        material: WebMaterial::Paper,
        thickness: sourced(80e-6, MEMORY),
        tangential_modulus: sourced(6e9, MEMORY),
        k1: sourced(10e3, PFEIFFER_MEMORY),
        k2: sourced(100.0, PFEIFFER_MEMORY),
        poisson_ratio: sourced(0.01, STACK_POISSON),
        friction: sourced(
            0.3,
            "(from memory) coated paper slides more easily than uncoated",
        ),
        kinetic_friction: sourced(0.2, KINETIC_MEMORY),
        density: sourced(1125.0, "computed: 90 g/m² over the 80 µm caliper"),
        roughness: sourced(
            1e-6,
            "(from memory) calendered coated surface, Rq about 1 µm",
        ),
        strength: sourced(4e3, MEMORY),
        typical_tension: sourced(3.0 * PLI, PAPER_TENSION_RULE),
    },
    WebPreset {
        id: "board",
        name: "Folding boxboard (about 16 pt)",
        material: WebMaterial::Board,
        thickness: sourced(400e-6, "common practice: 16 pt board is 0.016 in (406 µm)"),
        tangential_modulus: sourced(6e9, MEMORY),
        k1: sourced(15e3, PFEIFFER_MEMORY),
        k2: sourced(40.0, PFEIFFER_MEMORY),
        poisson_ratio: sourced(0.01, STACK_POISSON),
        friction: sourced(0.4, MEMORY),
        kinetic_friction: sourced(0.3, KINETIC_MEMORY),
        density: sourced(700.0, "(from memory) folding boxboard 0.6–0.8 g/cm³"),
        roughness: sourced(3e-6, MEMORY),
        strength: sourced(15e3, MEMORY),
        typical_tension: sourced(
            1e3,
            "(from memory) several pli for board, under 10 % of strength",
        ),
    },
    WebPreset {
        id: "pet_film",
        name: "PET (polyester) film, 23 µm",
        material: WebMaterial::Film,
        thickness: sourced(23e-6, "common practice: 92 gauge packaging polyester"),
        tangential_modulus: sourced(4.5e9, FILM_TABLE),
        k1: sourced(3e3, PFEIFFER_MEMORY),
        k2: sourced(300.0, PFEIFFER_MEMORY),
        poisson_ratio: sourced(0.01, STACK_POISSON),
        friction: sourced(0.4, PET_FRICTION),
        kinetic_friction: sourced(0.35, PET_FRICTION),
        density: sourced(1390.0, "(from memory) PET 1.39–1.40 g/cm³"),
        roughness: sourced(50e-9, "(from memory) filled PET film surface Rq tens of nm"),
        strength: sourced(23e-6 * 200e6, FILM_TABLE),
        typical_tension: sourced(0.75 * PLI * 23.0 / 25.4, FILM_TENSION_RULE),
    },
    WebPreset {
        id: "bopp_film",
        name: "BOPP (oriented polypropylene) film, 20 µm",
        material: WebMaterial::Film,
        thickness: sourced(20e-6, "common practice: 20 µm packaging BOPP"),
        tangential_modulus: sourced(2.5e9, FILM_TABLE),
        k1: sourced(3e3, PFEIFFER_MEMORY),
        k2: sourced(250.0, PFEIFFER_MEMORY),
        poisson_ratio: sourced(0.01, STACK_POISSON),
        friction: sourced(0.3, MEMORY),
        kinetic_friction: sourced(0.25, KINETIC_MEMORY),
        density: sourced(905.0, "(from memory) polypropylene 0.90–0.91 g/cm³"),
        roughness: sourced(100e-9, MEMORY),
        strength: sourced(20e-6 * 150e6, FILM_TABLE),
        typical_tension: sourced(0.375 * PLI * 20.0 / 25.4, FILM_TENSION_RULE),
    },
    WebPreset {
        id: "ldpe_film",
        name: "LDPE (low-density polyethylene) film, 50 µm",
        material: WebMaterial::Film,
        thickness: sourced(50e-6, "common practice: 2 mil blown film"),
        tangential_modulus: sourced(0.2e9, "(from memory) LDPE 0.1–0.3 GPa"),
        k1: sourced(2e3, PFEIFFER_MEMORY),
        k2: sourced(150.0, PFEIFFER_MEMORY),
        poisson_ratio: sourced(0.01, STACK_POISSON),
        friction: sourced(
            0.5,
            "(from memory) polyethylene film-to-film is grippy, 0.4–0.7",
        ),
        kinetic_friction: sourced(0.4, KINETIC_MEMORY),
        density: sourced(920.0, "(from memory) LDPE 0.91–0.93 g/cm³"),
        roughness: sourced(300e-9, MEMORY),
        strength: sourced(
            50e-6 * 20e6,
            "(from memory) MD tensile strength about 20 MPa",
        ),
        typical_tension: sourced(0.175 * PLI * 50.0 / 25.4, FILM_TENSION_RULE),
    },
    WebPreset {
        id: "aluminium_foil",
        name: "Aluminium foil, 9 µm (soft temper)",
        material: WebMaterial::Foil,
        thickness: sourced(9e-6, "common practice: 9 µm converter foil"),
        tangential_modulus: sourced(
            69e9,
            "(from memory) handbook modulus of aluminium about 69 GPa",
        ),
        k1: sourced(10e3, PFEIFFER_MEMORY),
        k2: sourced(400.0, PFEIFFER_MEMORY),
        poisson_ratio: sourced(0.01, STACK_POISSON),
        friction: sourced(0.3, MEMORY),
        kinetic_friction: sourced(0.25, KINETIC_MEMORY),
        density: sourced(
            2700.0,
            "(from memory) handbook density of aluminium 2.70 g/cm³",
        ),
        roughness: sourced(200e-9, MEMORY),
        strength: sourced(
            9e-6 * 70e6,
            "(from memory) annealed foil tensile strength 50–100 MPa",
        ),
        typical_tension: sourced(1.0 * PLI * 9.0 / 25.4, FILM_TENSION_RULE),
    },
    WebPreset {
        id: "spunbond_nonwoven",
        name: "Spunbond polypropylene nonwoven (about 20 g/m²)",
        material: WebMaterial::Nonwoven,
        thickness: sourced(200e-6, MEMORY),
        tangential_modulus: sourced(0.05e9, MEMORY),
        k1: sourced(1e3, PFEIFFER_MEMORY),
        k2: sourced(20.0, PFEIFFER_MEMORY),
        poisson_ratio: sourced(0.01, STACK_POISSON),
        friction: sourced(0.5, MEMORY),
        kinetic_friction: sourced(0.4, NONWOVEN_KINETIC),
        density: sourced(100.0, "computed: 20 g/m² over the 200 µm caliper"),
        roughness: sourced(20e-6, "(from memory) fibrous surface, Rq tens of µm"),
        strength: sourced(800.0, "(from memory) about 40 N per 50 mm strip MD"),
        typical_tension: sourced(
            0.2 * PLI,
            "(from memory) nonwovens wind at a fraction of a pli",
        ),
    },
];

/// Paperboard cores are spiral-wound and strongly orthotropic: the radial modulus is far below
/// the hoop modulus (Gerhardt, J. Eng. Mater. Technol. 112:144, 1990). Their crush estimate is
/// the lower of the wall's hoop stress (orthotropic tube, which puts the peak at the outer wall)
/// reaching the board's compressive strength and buckling of the free tube.
const PAPER_CORE_CRUSH: &str = "estimate: orthotropic wall hoop stress (Gerhardt 1990) reaching the paperboard strength, or buckling of the free core if lower";
const PAPER_CORE_MODULUS: &str =
    "(from memory) hoop modulus of spiral-wound paperboard cores 1–3 GPa";
const PAPER_CORE_RADIAL: &str = "(from memory) estimate: paperboard's through-thickness modulus is one to two orders of magnitude below its in-plane modulus; Gerhardt (1990) calls the radial modulus of paper tubes extremely small";
const PAPER_CORE_STRENGTH: &str =
    "(from memory) compressive strength of laminated core board about 20 MPa";

const ISOTROPIC_CORE: &str = "isotropic material: radial modulus equals the hoop modulus";

/// A spiral-wound paperboard core: the wall's moduli, Poisson ratio and strength are the same
/// for every size, so a paper core states only its diameters and the crush estimate that
/// follows from them.
const fn paper_core(
    id: &'static str,
    name: &'static str,
    [inside_diameter, outside_diameter]: [Sourced; 2],
    crush_pressure: f64,
) -> CorePreset {
    CorePreset {
        id,
        name,
        material: CoreMaterial::Paper,
        inside_diameter,
        outside_diameter,
        modulus: sourced(2e9, PAPER_CORE_MODULUS),
        radial_modulus: sourced(40e6, PAPER_CORE_RADIAL),
        poisson_ratio: sourced(0.3, MEMORY),
        compressive_strength: sourced(20e6, PAPER_CORE_STRENGTH),
        crush_pressure: sourced(crush_pressure, PAPER_CORE_CRUSH),
    }
}

const BORE_3IN: Sourced = sourced(3.0 * INCH, "common practice: 3 in (76.2 mm) bore");
const BORE_6IN: Sourced = sourced(6.0 * INCH, "common practice: 6 in (152.4 mm) bore");

const CORE_PRESETS: [CorePreset; 7] = [
    paper_core(
        "paper_3in",
        "Paper core, 3 in bore, 1/2 in wall",
        [
            BORE_3IN,
            sourced(4.0 * INCH, "common practice: 1/2 in wall"),
        ],
        2.7e6,
    ),
    paper_core(
        "paper_3in_thin",
        "Paper core, 3 in bore, 1/4 in wall",
        [
            BORE_3IN,
            sourced(3.5 * INCH, "common practice: 1/4 in wall"),
        ],
        1.8e6,
    ),
    paper_core(
        "paper_6in",
        "Paper core, 6 in bore, 1/2 in wall",
        [
            BORE_6IN,
            sourced(7.0 * INCH, "common practice: 1/2 in wall"),
        ],
        1.8e6,
    ),
    paper_core(
        "paper_6in_heavy",
        "Paper core, 6 in bore, 3/4 in wall",
        [
            BORE_6IN,
            sourced(7.5 * INCH, "common practice: 3/4 in wall"),
        ],
        2.6e6,
    ),
    CorePreset {
        id: "steel_6in",
        name: "Steel core or spool, 6 in bore, 1/4 in wall",
        material: CoreMaterial::Steel,
        inside_diameter: sourced(6.0 * INCH, "common practice: 6 in bore"),
        outside_diameter: sourced(6.5 * INCH, "common practice: 1/4 in wall"),
        modulus: sourced(
            200e9,
            "(from memory) handbook modulus of carbon steel about 200 GPa",
        ),
        radial_modulus: sourced(200e9, ISOTROPIC_CORE),
        poisson_ratio: sourced(0.3, "(from memory) handbook value for steel"),
        compressive_strength: sourced(
            250e6,
            "(from memory) yield stress of structural steel about 250 MPa",
        ),
        crush_pressure: sourced(
            18e6,
            "estimate: Lamé bore hoop stress reaching the 250 MPa yield",
        ),
    },
    CorePreset {
        id: "aluminium_6in",
        name: "Aluminium core, 6 in bore, 1/4 in wall",
        material: CoreMaterial::Aluminium,
        inside_diameter: sourced(6.0 * INCH, "common practice: 6 in bore"),
        outside_diameter: sourced(6.5 * INCH, "common practice: 1/4 in wall"),
        modulus: sourced(
            69e9,
            "(from memory) handbook modulus of aluminium alloys about 69 GPa",
        ),
        radial_modulus: sourced(69e9, ISOTROPIC_CORE),
        poisson_ratio: sourced(0.33, "(from memory) handbook value for aluminium"),
        compressive_strength: sourced(
            200e6,
            "(from memory) yield stress of aluminium alloys about 200 MPa",
        ),
        crush_pressure: sourced(
            8.8e6,
            "estimate: buckling of the free thin-walled core (below the yield estimate)",
        ),
    },
    CorePreset {
        id: "plastic_3in",
        name: "Plastic (ABS) core, 3 in bore, 6 mm wall",
        material: CoreMaterial::Plastic,
        inside_diameter: sourced(3.0 * INCH, "common practice: 3 in bore"),
        outside_diameter: sourced(3.0 * INCH + 0.012, MEMORY),
        modulus: sourced(2.3e9, "(from memory) ABS modulus about 2–2.5 GPa"),
        radial_modulus: sourced(2.3e9, ISOTROPIC_CORE),
        poisson_ratio: sourced(0.35, MEMORY),
        compressive_strength: sourced(
            24e6,
            "(from memory) about half the compressive strength of ABS (~50 MPa), allowing for creep",
        ),
        crush_pressure: sourced(
            1.8e6,
            "estimate: buckling of the free core (below the wall-stress estimate)",
        ),
    },
];

/// Line speed used when a case gives none (m/s).
/// Dynamic factor on the roll's weight when it is lifted by its core or set down on end (the
/// telescoping check): a load applied suddenly, without drop height, to a linear elastic system
/// gives twice the static deflection and stress (energy balance of a suddenly applied load,
/// closed form in strength-of-materials texts, e.g. Gere & Timoshenko, Mechanics of Materials,
/// impact loading — from memory). Rough handling with a drop gives more.
pub const DEFAULT_SHOCK_FACTOR: Sourced = sourced(
    2.0,
    "suddenly applied load without drop height: twice the static stress (closed form of the energy balance, strength-of-materials texts such as Gere & Timoshenko, from memory)",
);
/// Run-up time to line speed, and normal stop time, when a case gives none (s): the start-up and
/// stop events of the layer-slip check (docs/theory.md §5).
pub const DEFAULT_RAMP_TIME: Sourced = sourced(
    20.0,
    "typical run-up of a production winder (from memory); start-up and normal-stop slip checks",
);
/// Emergency stop time when a case gives none (s), web tension taken as lost.
pub const DEFAULT_EMERGENCY_STOP_TIME: Sourced = sourced(
    4.0,
    "a few seconds on production winders (from memory); web tension taken as lost",
);
pub const DEFAULT_SPEED: Sourced =
    sourced(5.0, "common practice: a moderate 300 m/min rewinding speed");
/// Web width used when a case gives none (m). Stresses are per unit width, so it only scales
/// totals (forces, torques).
pub const DEFAULT_WIDTH: Sourced = sourced(1.0, "default: results are per unit width");
/// Nip load above which the nip-induced tension is held (N/m).
pub const DEFAULT_NIP_PLATEAU: Sourced = sourced(
    crate::model::winder::NIP_MODEL_LIMIT,
    "common practice: μ·N is a good estimate up to about 10 pli (2 kN/m), where measured nip-induced tension levels off (PFFC Web Lines; Good and co-workers)",
);
/// Drum diameter of a two-drum winder when a case gives none (m).
pub const DEFAULT_DRUM_DIAMETER: Sourced = sourced(
    0.5,
    "(from memory) a common two-drum winder drum size, about 20 in",
);
/// Finished roll diameter used when a case gives neither diameter nor length (m).
pub const DEFAULT_ROLL_DIAMETER: Sourced = sourced(1.0, "common practice: a 1 m finished roll");

impl CorePreset {
    /// The preset as a hollow tube (orthotropic where the moduli differ) in the given support.
    pub fn tube(&self, support: crate::model::CoreSupport) -> crate::model::CoreStiffness {
        crate::model::CoreStiffness::Tube {
            inner_radius: self.inside_diameter.value / 2.0,
            outer_radius: self.outside_diameter.value / 2.0,
            hoop_modulus: self.modulus.value,
            radial_modulus: self.radial_modulus.value,
            poisson_ratio: self.poisson_ratio.value,
            support,
        }
    }
}

/// All web presets.
pub fn web_presets() -> &'static [WebPreset] {
    &WEB_PRESETS
}

/// All core presets.
pub fn core_presets() -> &'static [CorePreset] {
    &CORE_PRESETS
}

/// The web preset with this ID.
pub fn web_preset(id: &str) -> Option<&'static WebPreset> {
    WEB_PRESETS.iter().find(|p| p.id == id)
}

/// The core preset with this ID.
pub fn core_preset(id: &str) -> Option<&'static CorePreset> {
    CORE_PRESETS.iter().find(|p| p.id == id)
}

/// The closest web preset ID to an unknown `id`, for "did you mean".
pub fn suggest_web(id: &str) -> Option<&'static str> {
    crate::vocabulary::closest(id, WEB_PRESETS.iter().map(|p| p.id))
}

/// The closest core preset ID to an unknown `id`, for "did you mean".
pub fn suggest_core(id: &str) -> Option<&'static str> {
    crate::vocabulary::closest(id, CORE_PRESETS.iter().map(|p| p.id))
}

/// The web preset used for a material kind when the case names no preset.
pub fn default_web_for_material(material: WebMaterial) -> &'static WebPreset {
    let id = match material {
        WebMaterial::Board => "board",
        WebMaterial::Film | WebMaterial::Laminate => "pet_film",
        WebMaterial::Foil => "aluminium_foil",
        WebMaterial::Nonwoven => "spunbond_nonwoven",
        WebMaterial::Paper => "newsprint",
    };
    web_preset(id).unwrap_or(&WEB_PRESETS[0])
}

/// The core preset used when the case names none: by core material, then by the web kind
/// (films and foil usually run on 6 in cores, paper on 3 in), and the one whose outside
/// diameter is nearest to `outside_diameter` when that is given.
pub fn default_core_for(
    core_material: Option<CoreMaterial>,
    web_material: WebMaterial,
    outside_diameter: Option<f64>,
) -> &'static CorePreset {
    // A rigid core is modelled as infinitely stiff; its diameters come from a steel core.
    let material = match core_material {
        Some(CoreMaterial::Rigid) => CoreMaterial::Steel,
        Some(m) => m,
        None => CoreMaterial::Paper,
    };
    let candidates: Vec<&'static CorePreset> = CORE_PRESETS
        .iter()
        .filter(|p| p.material == material)
        .collect();
    if let (Some(d), false) = (outside_diameter, candidates.is_empty()) {
        let nearest = candidates.iter().min_by(|a, b| {
            (a.outside_diameter.value - d)
                .abs()
                .total_cmp(&(b.outside_diameter.value - d).abs())
        });
        if let Some(p) = nearest {
            return p;
        }
    }
    let id = match (material, web_material) {
        (CoreMaterial::Paper, WebMaterial::Film | WebMaterial::Foil | WebMaterial::Laminate) => {
            "paper_6in"
        }
        (CoreMaterial::Paper, _) => "paper_3in",
        (CoreMaterial::Steel | CoreMaterial::Rigid, _) => "steel_6in",
        (CoreMaterial::Aluminium, _) => "aluminium_6in",
        (CoreMaterial::Plastic, _) => "plastic_3in",
    };
    core_preset(id).unwrap_or(&CORE_PRESETS[0])
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_value_has_a_source() {
        for p in web_presets() {
            for s in [
                p.thickness,
                p.tangential_modulus,
                p.k1,
                p.k2,
                p.poisson_ratio,
                p.friction,
                p.kinetic_friction,
                p.density,
                p.roughness,
                p.strength,
                p.typical_tension,
            ] {
                assert!(s.value.is_finite() && s.value > 0.0, "{}", p.id);
                assert!(!s.source.trim().is_empty(), "{}", p.id);
            }
            // Kinetic friction is below static (Good, Hartwig & Markum 1999 for newsprint;
            // ASTM D1894 film data).
            assert!(p.kinetic_friction.value <= p.friction.value, "{}", p.id);
            // Common practice: winding tension stays well under the web's strength.
            assert!(p.typical_tension.value < 0.3 * p.strength.value, "{}", p.id);
        }
        for p in core_presets() {
            assert!(
                p.inside_diameter.value < p.outside_diameter.value,
                "{}",
                p.id
            );
            for s in [
                p.modulus,
                p.radial_modulus,
                p.poisson_ratio,
                p.compressive_strength,
                p.crush_pressure,
            ] {
                assert!(s.value > 0.0 && !s.source.is_empty(), "{}", p.id);
            }
        }
    }

    #[test]
    fn core_crush_ratings_follow_the_crush_estimate() {
        // The preset crush pressure is the model's own estimate from the preset's moduli and
        // strength (orthotropic wall stress or buckling of the free core), rounded.
        for p in core_presets() {
            let tube = p.tube(crate::model::CoreSupport::Free);
            let limit =
                crate::model::core_crush::estimated_limit(&tube, p.compressive_strength.value)
                    .unwrap();
            let ratio = p.crush_pressure.value / limit.pressure;
            assert!((0.95..1.05).contains(&ratio), "{}: {ratio}", p.id);
        }
    }

    #[test]
    fn paper_cores_are_orthotropic() {
        for p in core_presets()
            .iter()
            .filter(|p| p.material == crate::vocabulary::CoreMaterial::Paper)
        {
            assert!(p.radial_modulus.value < 0.1 * p.modulus.value, "{}", p.id);
        }
    }

    #[test]
    fn soft_reference_web_matches_the_engine_reference() {
        let p = web_preset("soft_paper_reference").unwrap();
        assert_eq!(p.k1.value, 5e3);
        assert_eq!(p.k2.value, 50.0);
        assert_eq!(p.thickness.value, 76e-6);
    }

    #[test]
    fn suggestions_and_defaults() {
        assert_eq!(suggest_web("newsprnt"), Some("newsprint"));
        assert_eq!(suggest_core("paper_3inch"), Some("paper_3in"));
        assert_eq!(default_web_for_material(WebMaterial::Film).id, "pet_film");
        assert_eq!(
            default_core_for(None, WebMaterial::Film, None).id,
            "paper_6in"
        );
        assert_eq!(
            default_core_for(Some(CoreMaterial::Paper), WebMaterial::Paper, Some(0.18)).id,
            "paper_6in"
        );
        assert_eq!(
            default_core_for(Some(CoreMaterial::Steel), WebMaterial::Paper, None).id,
            "steel_6in"
        );
    }
}

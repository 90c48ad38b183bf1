//! Numbers the rules may test, computed once per profile and case.

use serde::{Deserialize, Serialize};

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct IndicatorValue {
    pub id: String,
    pub zone: Option<String>,
    /// SI value (or dimensionless ratio).
    pub value: f64,
    pub unit: String,
    pub meaning: String,
}

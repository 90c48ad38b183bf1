//! Rule-base YAML schema → validated, compiled rules; lint with file/line errors.

/// A rule-base error naming file, line and the closest valid name.
#[derive(Debug, thiserror::Error)]
pub enum RuleError {
    #[error("{file}:{line}: {message}")]
    Invalid {
        file: String,
        line: usize,
        message: String,
    },
}

/// The compiled rule base.
#[derive(Debug, Clone, Default)]
pub struct RuleBase {}

impl RuleBase {
    /// The rule base shipped inside the binary.
    pub fn embedded() -> Result<RuleBase, RuleError> {
        Ok(RuleBase {})
    }

    /// Load a rule directory (overrides the shipped rules).
    pub fn load_dir(_path: &std::path::Path) -> Result<RuleBase, RuleError> {
        Ok(RuleBase {})
    }
}

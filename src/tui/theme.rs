//! Colours and text styles. With `NO_COLOR` set (https://no-color.org) every style is plain or
//! bold/reversed only, and nothing on screen depends on colour: zones carry labels and
//! patterns, curves carry different glyphs.

use ratatui::style::{Color, Modifier, Style};

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Theme {
    pub color: bool,
}

impl Theme {
    /// Colour unless `NO_COLOR` is set to a non-empty value.
    pub fn from_env() -> Theme {
        let no_color = std::env::var_os("NO_COLOR").is_some_and(|v| !v.is_empty());
        Theme { color: !no_color }
    }

    pub fn monochrome() -> Theme {
        Theme { color: false }
    }

    fn fg(&self, color: Color) -> Style {
        if self.color {
            Style::new().fg(color)
        } else {
            Style::new()
        }
    }

    pub fn plain(&self) -> Style {
        Style::new()
    }
    pub fn title(&self) -> Style {
        self.fg(Color::Cyan).add_modifier(Modifier::BOLD)
    }
    /// The highlighted row or the active tab.
    pub fn selected(&self) -> Style {
        Style::new().add_modifier(Modifier::REVERSED)
    }
    pub fn dim(&self) -> Style {
        if self.color {
            Style::new().fg(Color::DarkGray)
        } else {
            Style::new()
        }
    }
    pub fn key(&self) -> Style {
        self.fg(Color::Yellow).add_modifier(Modifier::BOLD)
    }
    pub fn error(&self) -> Style {
        self.fg(Color::Red).add_modifier(Modifier::BOLD)
    }
    pub fn good(&self) -> Style {
        self.fg(Color::Green)
    }
    pub fn warn(&self) -> Style {
        self.fg(Color::Yellow)
    }
    pub fn assumed(&self) -> Style {
        self.fg(Color::Magenta)
    }
    /// The main curve (after, or the only one).
    pub fn curve(&self) -> Style {
        self.fg(Color::Cyan)
    }
    /// The comparison curve (before).
    pub fn curve_before(&self) -> Style {
        self.fg(Color::Yellow)
    }
    pub fn zone_label(&self) -> Style {
        self.fg(Color::Blue)
    }
    pub fn limit_line(&self) -> Style {
        self.fg(Color::Red)
    }
}

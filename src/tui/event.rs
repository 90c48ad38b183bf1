//! Input events in the UI's own terms, and their translation from crossterm. The app state only
//! ever sees [`Key`] and [`Event`], so it can be driven by tests without a terminal.

use ratatui::crossterm::event as ct;

/// A key press as the app understands it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Key {
    Char(char),
    /// Ctrl held with a letter, lower-case.
    Ctrl(char),
    /// Alt held with a character. Terminals send Alt-x as Esc then x, so an Esc followed
    /// quickly by a letter (a busy machine, a fast typist) arrives as this too: the app takes
    /// it as Esc, then the character.
    Alt(char),
    Enter,
    Esc,
    Backspace,
    Delete,
    Tab,
    BackTab,
    Up,
    Down,
    Left,
    Right,
    PageUp,
    PageDown,
    Home,
    End,
    F(u8),
}

/// What a mouse did, in cell coordinates.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Mouse {
    ScrollUp,
    ScrollDown,
    Click { column: u16, row: u16 },
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Event {
    Key(Key),
    Mouse(Mouse),
    Resize,
}

/// Translate a crossterm event; `None` for events the UI ignores (key releases, focus, paste).
pub fn from_crossterm(event: &ct::Event) -> Option<Event> {
    match event {
        ct::Event::Key(key) if key.kind != ct::KeyEventKind::Release => {
            translate_key(key).map(Event::Key)
        }
        ct::Event::Mouse(mouse) => match mouse.kind {
            ct::MouseEventKind::ScrollUp => Some(Event::Mouse(Mouse::ScrollUp)),
            ct::MouseEventKind::ScrollDown => Some(Event::Mouse(Mouse::ScrollDown)),
            ct::MouseEventKind::Down(ct::MouseButton::Left) => Some(Event::Mouse(Mouse::Click {
                column: mouse.column,
                row: mouse.row,
            })),
            _ => None,
        },
        ct::Event::Resize(_, _) => Some(Event::Resize),
        _ => None,
    }
}

fn translate_key(key: &ct::KeyEvent) -> Option<Key> {
    let ctrl = key.modifiers.contains(ct::KeyModifiers::CONTROL);
    Some(match key.code {
        ct::KeyCode::Char(c) if ctrl => Key::Ctrl(c.to_ascii_lowercase()),
        ct::KeyCode::Char(c) if key.modifiers.contains(ct::KeyModifiers::ALT) => Key::Alt(c),
        ct::KeyCode::Char(c) => Key::Char(c),
        ct::KeyCode::Enter => Key::Enter,
        ct::KeyCode::Esc => Key::Esc,
        ct::KeyCode::Backspace => Key::Backspace,
        ct::KeyCode::Delete => Key::Delete,
        ct::KeyCode::Tab if key.modifiers.contains(ct::KeyModifiers::SHIFT) => Key::BackTab,
        ct::KeyCode::Tab => Key::Tab,
        ct::KeyCode::BackTab => Key::BackTab,
        ct::KeyCode::Up => Key::Up,
        ct::KeyCode::Down => Key::Down,
        ct::KeyCode::Left => Key::Left,
        ct::KeyCode::Right => Key::Right,
        ct::KeyCode::PageUp => Key::PageUp,
        ct::KeyCode::PageDown => Key::PageDown,
        ct::KeyCode::Home => Key::Home,
        ct::KeyCode::End => Key::End,
        ct::KeyCode::F(n) => Key::F(n),
        _ => return None,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ctrl_letters_and_releases() {
        let press = ct::KeyEvent::new(ct::KeyCode::Char('S'), ct::KeyModifiers::CONTROL);
        assert_eq!(
            from_crossterm(&ct::Event::Key(press)),
            Some(Event::Key(Key::Ctrl('s')))
        );
        let mut release = ct::KeyEvent::new(ct::KeyCode::Char('a'), ct::KeyModifiers::NONE);
        release.kind = ct::KeyEventKind::Release;
        assert_eq!(from_crossterm(&ct::Event::Key(release)), None);
    }

    #[test]
    fn esc_and_a_letter_run_together_arrive_as_alt() {
        let alt = ct::KeyEvent::new(ct::KeyCode::Char('c'), ct::KeyModifiers::ALT);
        assert_eq!(
            from_crossterm(&ct::Event::Key(alt)),
            Some(Event::Key(Key::Alt('c')))
        );
    }
}

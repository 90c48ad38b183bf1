//! Terminal UI (the only module that imports ratatui/crossterm): app state, events, screens;
//! the solver runs off the UI thread.

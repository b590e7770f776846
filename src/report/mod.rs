//! Rendering a [`Study`](crate::outcome::Study): terminal table, CSV, JSON,
//! SVG charts and a self-contained HTML report. The only module besides
//! `network::load` that writes files.

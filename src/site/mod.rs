//! Rendering a Report into a static site.

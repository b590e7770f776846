//! TOML scenario files that reproduce a whole study.

//! Progress bars for long library phases: an indicatif bar on stderr when
//! stderr is a terminal and `--quiet` is not given, nothing otherwise.
//! The library reports phases through [`spreadplan::progress::Progress`];
//! this file only draws them.

use std::io::IsTerminal;
use std::sync::Mutex;

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use spreadplan::progress::{Progress, Silent};

/// A progress bar on stderr, one bar per phase.
pub(crate) struct Bars {
    bar: Mutex<Option<ProgressBar>>,
}

impl Bars {
    fn new() -> Self {
        Bars { bar: Mutex::new(None) }
    }

    fn with(&self, f: impl FnOnce(&mut Option<ProgressBar>)) {
        if let Ok(mut g) = self.bar.lock() {
            f(&mut g);
        }
    }
}

impl Progress for Bars {
    fn phase(&self, name: &str, total: u64) {
        self.with(|slot| {
            if let Some(old) = slot.take() {
                old.finish_and_clear();
            }
            let bar = ProgressBar::with_draw_target(Some(total), ProgressDrawTarget::stderr());
            let style = ProgressStyle::with_template(
                "{msg:>24} [{bar:32}] {pos}/{len} ({elapsed}, eta {eta})",
            )
            .unwrap_or_else(|_| ProgressStyle::default_bar())
            .progress_chars("=> ");
            bar.set_style(style);
            bar.set_message(name.to_owned());
            *slot = Some(bar);
        });
    }

    fn advance(&self, n: u64) {
        self.with(|slot| {
            if let Some(b) = slot {
                b.inc(n);
            }
        });
    }

    fn finish(&self) {
        self.with(|slot| {
            if let Some(b) = slot.take() {
                b.finish_and_clear();
            }
        });
    }
}

impl Drop for Bars {
    fn drop(&mut self) {
        self.finish();
    }
}

/// The progress sink for a command: bars on stderr when it is a terminal
/// and `quiet` is false, silence otherwise.
pub(crate) fn for_cli(quiet: bool) -> Box<dyn Progress> {
    if !quiet && std::io::stderr().is_terminal() {
        Box::new(Bars::new())
    } else {
        Box::new(Silent)
    }
}

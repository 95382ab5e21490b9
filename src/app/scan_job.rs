//! A Walsh scan running off the UI thread: the library's `run_scan` on its own thread
//! (which itself spreads the points over the cores), with its progress counter and cancel
//! flag shared with the window. One scan at a time; starting another cancels the first.

use std::sync::Arc;
use std::sync::mpsc::{Receiver, TryRecvError, channel};

use diptych::analysis::Settings;
use diptych::chem::Molecule;
use diptych::scan::{Scan, ScanProgress, ScanRequest, run_scan};
use eframe::egui;

use super::guard::guarded;

/// A scan under way.
pub struct ScanJob {
    pub progress: Arc<ScanProgress>,
    outcome: Receiver<Result<Scan, String>>,
}

impl ScanJob {
    /// Plans and runs `request` on a copy of the document; the UI is woken when done.
    pub fn start(
        context: egui::Context,
        molecule: Molecule,
        settings: Settings,
        request: ScanRequest,
    ) -> ScanJob {
        let progress = Arc::new(ScanProgress::new());
        let (sender, outcome) = channel();
        let shared = Arc::clone(&progress);
        let spawned = std::thread::Builder::new()
            .name("walsh scan".into())
            .spawn(move || {
                let result = guarded("the scan", || {
                    run_scan(&molecule, &settings, &request, &shared)
                        .map_err(|error| error.to_string())
                });
                let _ = sender.send(result);
                context.request_repaint();
            });
        if let Err(error) = spawned {
            // The receiver then reports the failure on the next poll.
            let (sender, receiver) = channel();
            let _ = sender.send(Err(format!("cannot start the scan thread: {error}")));
            return ScanJob {
                progress,
                outcome: receiver,
            };
        }
        ScanJob { progress, outcome }
    }

    /// The finished result, if the scan has ended.
    pub fn poll(&self) -> Option<Result<Scan, String>> {
        match self.outcome.try_recv() {
            Ok(result) => Some(result),
            Err(TryRecvError::Empty) => None,
            Err(TryRecvError::Disconnected) => Some(Err("the scan thread stopped".into())),
        }
    }

    pub fn cancel(&self) {
        self.progress.cancel();
    }
}

//! Runs `Analysis::run` on a background thread so the window never waits for chemistry.
//! Requests carry a generation number; the thread always works on the newest request
//! and the UI ignores results older than the document it shows. A panic inside the
//! analysis comes back as an error (`guard::guarded`) and the thread goes on serving.

use std::sync::Arc;
use std::sync::mpsc::{Receiver, Sender, channel};

use diptych::analysis::{Analysis, Settings};
use diptych::chem::Molecule;
use eframe::egui;

use super::guard::guarded;

struct Request {
    generation: u64,
    molecule: Molecule,
    settings: Settings,
}

/// A finished run: the generation it was asked for and its result.
pub struct Outcome {
    pub generation: u64,
    pub result: Result<Arc<Analysis>, String>,
}

/// Handle to the analysis thread.
pub struct AnalysisWorker {
    requests: Sender<Request>,
    outcomes: Receiver<Outcome>,
}

impl AnalysisWorker {
    /// Starts the thread; it wakes the UI through `context` when a result is ready.
    pub fn start(context: egui::Context) -> AnalysisWorker {
        let (requests, request_receiver) = channel::<Request>();
        let (outcome_sender, outcomes) = channel();
        std::thread::Builder::new()
            .name("analysis".into())
            .spawn(move || {
                while let Ok(mut request) = request_receiver.recv() {
                    // Skip to the newest request: older ones are superseded.
                    while let Ok(newer) = request_receiver.try_recv() {
                        request = newer;
                    }
                    let result = guarded("the analysis", || {
                        Analysis::run(&request.molecule, &request.settings)
                            .map(Arc::new)
                            .map_err(|error| error.to_string())
                    });
                    let outcome = Outcome {
                        generation: request.generation,
                        result,
                    };
                    if outcome_sender.send(outcome).is_err() {
                        break;
                    }
                    context.request_repaint();
                }
            })
            .ok();
        AnalysisWorker { requests, outcomes }
    }

    /// Asks for an analysis of this document state.
    pub fn request(&self, generation: u64, molecule: &Molecule, settings: &Settings) {
        let _ = self.requests.send(Request {
            generation,
            molecule: molecule.clone(),
            settings: settings.clone(),
        });
    }

    /// The results that arrived since the last call.
    pub fn poll(&self) -> Vec<Outcome> {
        self.outcomes.try_iter().collect()
    }
}

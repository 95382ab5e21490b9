//! The debug overlay's frame-time counter: CPU time spent building each frame (our UI
//! code and egui's layout, not the GPU), averaged over the last frames.

use std::collections::VecDeque;
use std::time::Duration;

use eframe::egui;

/// Frames averaged in the overlay.
const WINDOW: usize = 60;

#[derive(Default)]
pub struct FrameTimer {
    pub visible: bool,
    recent: VecDeque<Duration>,
}

impl FrameTimer {
    pub fn record(&mut self, spent: Duration) {
        if self.recent.len() == WINDOW {
            self.recent.pop_front();
        }
        self.recent.push_back(spent);
    }

    /// Mean and worst of the recorded frames, in milliseconds.
    pub fn summary(&self) -> Option<(f64, f64)> {
        if self.recent.is_empty() {
            return None;
        }
        let millis = self.recent.iter().map(|d| d.as_secs_f64() * 1e3);
        let worst = millis.clone().fold(0.0, f64::max);
        Some((millis.sum::<f64>() / self.recent.len() as f64, worst))
    }

    /// Draws the counter in the bottom-right corner when switched on (View menu).
    pub fn show(&self, ctx: &egui::Context) {
        if !self.visible {
            return;
        }
        let Some((mean, worst)) = self.summary() else {
            return;
        };
        egui::Area::new(egui::Id::unique("frame time overlay"))
            .anchor(egui::Align2::RIGHT_BOTTOM, egui::vec2(-12.0, -36.0))
            .interactable(false)
            .show(ctx, |ui| {
                egui::Frame::popup(ui.style()).show(ui, |ui| {
                    ui.monospace(format!(
                        "frame CPU {mean:.2} ms (worst {worst:.2} ms, last {} frames)",
                        self.recent.len()
                    ));
                });
            });
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn averages_only_the_last_window_of_frames() {
        let mut timer = FrameTimer::default();
        assert_eq!(timer.summary(), None);
        for _ in 0..WINDOW {
            timer.record(Duration::from_millis(10));
        }
        for _ in 0..WINDOW {
            timer.record(Duration::from_millis(2));
        }
        let (mean, worst) = timer.summary().expect("frames recorded");
        assert!((mean - 2.0).abs() < 1e-9, "old frames dropped: {mean}");
        assert!((worst - 2.0).abs() < 1e-9);
    }
}

//! `--screenshot OUT.png`: let the real window render a few frames (and the first
//! analysis arrive), ask the viewport for a screenshot, write it as PNG through the
//! library's one writer (`chem::io::write_file`, with the `--force` rule the command line
//! checked before the window opened) and close.

use std::path::PathBuf;
use std::sync::{Arc, Mutex};

use diptych::chem::io::{Overwrite, write_file};
use eframe::egui;

/// Where the screenshot goes and whether an existing file there may be replaced.
#[derive(Clone, Debug)]
pub struct ScreenshotTarget {
    pub path: PathBuf,
    pub overwrite: Overwrite,
}

/// Where the outcome of the screenshot is reported back to `run`.
#[derive(Clone, Default)]
pub struct ResultSlot(Arc<Mutex<Option<Result<(), String>>>>);

impl ResultSlot {
    fn set(&self, value: Result<(), String>) {
        if let Ok(mut slot) = self.0.lock() {
            *slot = Some(value);
        }
    }

    fn is_set(&self) -> bool {
        self.0.lock().map(|slot| slot.is_some()).unwrap_or(true)
    }

    /// The outcome, or an error if the window closed before a screenshot was taken.
    pub fn result(&self) -> Result<(), String> {
        self.0
            .lock()
            .ok()
            .and_then(|slot| slot.clone())
            .unwrap_or_else(|| Err("the window closed before the screenshot was taken".into()))
    }
}

pub struct ScreenshotTask {
    target: ScreenshotTarget,
    frames: u32,
    requested: bool,
    slot: ResultSlot,
}

/// Frames to render before the screenshot, so that layout and fonts have settled.
const WARM_UP_FRAMES: u32 = 8;
/// Give up waiting for the first analysis after this many frames.
const MAX_FRAMES: u32 = 600;

impl ScreenshotTask {
    pub fn new(target: ScreenshotTarget) -> ScreenshotTask {
        ScreenshotTask {
            target,
            frames: 0,
            requested: false,
            slot: ResultSlot::default(),
        }
    }

    pub fn report_to(&mut self, slot: ResultSlot) {
        self.slot = slot;
    }

    /// Called once per frame.
    pub fn step(&mut self, context: &egui::Context, content_ready: bool) {
        self.frames += 1;
        if self.slot.is_set() {
            context.send_viewport_cmd(egui::ViewportCommand::Close);
            return;
        }
        context.request_repaint();
        let ready = (content_ready && self.frames >= WARM_UP_FRAMES) || self.frames >= MAX_FRAMES;
        if ready && !self.requested {
            self.requested = true;
            let target = self.target.clone();
            let slot = self.slot.clone();
            let waker = context.clone();
            context.request_screenshot(move |image| {
                slot.set(write_png(&target, &image));
                waker.request_repaint();
            });
        }
    }
}

fn write_png(target: &ScreenshotTarget, image: &egui::ColorImage) -> Result<(), String> {
    let [width, height] = image.size;
    let mut bytes = Vec::with_capacity(width * height * 4);
    for pixel in &image.pixels {
        bytes.extend_from_slice(&pixel.to_srgba_unmultiplied());
    }
    let mut encoded = Vec::new();
    {
        let mut encoder = png::Encoder::new(&mut encoded, width as u32, height as u32);
        encoder.set_color(png::ColorType::Rgba);
        encoder.set_depth(png::BitDepth::Eight);
        let mut writer = encoder
            .write_header()
            .map_err(|e| format!("PNG encoding failed: {e}"))?;
        writer
            .write_image_data(&bytes)
            .map_err(|e| format!("PNG encoding failed: {e}"))?;
    }
    write_file(&target.path, &encoded, target.overwrite).map_err(|error| error.to_string())
}

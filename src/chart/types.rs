//! What every chart shares: the sizes, the error type and the drawing trait (a leaf module, so
//! the chart modules and `mod.rs` do not import each other).

use plotters::coord::Shift;
use plotters::prelude::*;
use std::path::PathBuf;

/// Pass chart size, pixels.
pub const PASS_SIZE: (u32, u32) = (1600, 1000);
/// Sky chart size, pixels (the sky and, beside it, the pass table and the legend).
pub const SKY_SIZE: (u32, u32) = (1400, 1000);
/// Mask trade-off chart size, pixels.
pub const MASK_SIZE: (u32, u32) = (1600, 1000);
/// Plan summary chart size, pixels.
pub const SUMMARY_SIZE: (u32, u32) = (1600, 1000);

/// What can go wrong while drawing or saving a chart.
#[derive(Debug, thiserror::Error)]
pub enum ChartError {
    #[error("the bundled chart font could not be loaded")]
    Font,
    #[error("drawing the {chart} chart failed: {message}")]
    Draw {
        chart: &'static str,
        message: String,
    },
    #[error("encoding the PNG failed: {0}")]
    Encode(String),
    #[error("chart input: {what} has {got} values but {expected} were expected")]
    LengthMismatch {
        what: String,
        expected: usize,
        got: usize,
    },
    #[error("writing chart {}: {source}", path.display())]
    Io {
        path: PathBuf,
        #[source]
        source: std::io::Error,
    },
}

impl<E: std::error::Error + Send + Sync> From<DrawingAreaErrorKind<E>> for ChartError {
    fn from(e: DrawingAreaErrorKind<E>) -> Self {
        ChartError::Draw {
            chart: "",
            message: e.to_string(),
        }
    }
}

/// A chart that can draw itself on any plotters backend.
pub(super) trait Plot {
    const NAME: &'static str;
    fn size(&self) -> (u32, u32);
    /// Warnings for the footer, under the caution (the element-age warning of stale elements).
    fn warnings(&self) -> &[String];
    fn plot<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), ChartError>
    where
        DB::ErrorType: 'static;
}

//! Sky chart (placeholder while being written).
use plotters::coord::Shift;
use plotters::prelude::*;

use super::{ChartError, MaskChartData, Plot, MASK_SIZE};

impl Plot for MaskChartData {
    const NAME: &'static str = "mask";
    fn size(&self) -> (u32, u32) {
        MASK_SIZE
    }
    fn plot<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), ChartError>
    where
        DB::ErrorType: 'static,
    {
        root.fill(&WHITE)?;
        Ok(())
    }
}
pub(super) fn check(_d: &MaskChartData) -> Result<(), ChartError> {
    Ok(())
}

//! What an engine reports about its run: per step the degree, pairs, matrix shape and time.

#[derive(Clone, Debug, Default, PartialEq)]
pub struct StepStats {
    /// Degree (sugar or total degree) of the pairs handled in this step.
    pub degree: u32,
    pub pairs: usize,
    /// Matrix rows × columns and nonzeros (0 for engines without matrices).
    pub rows: usize,
    pub columns: usize,
    pub nonzeros: usize,
    /// New basis elements found in this step.
    pub new_elements: usize,
    pub seconds_symbolic: f64,
    pub seconds_linear_algebra: f64,
    /// Multiply-adds performed by the linear algebra of this step (0 for engines without matrices).
    pub multiply_adds: u64,
}

#[derive(Clone, Debug, Default, PartialEq)]
pub struct Stats {
    pub engine: String,
    pub steps: Vec<StepStats>,
    /// Pairs whose S-polynomial reduced to zero (wasted work).
    pub zero_reductions: usize,
    pub seconds: f64,
}

impl Stats {
    /// Highest degree reached: what is often called the solving degree.
    pub fn max_degree(&self) -> u32 {
        self.steps.iter().map(|s| s.degree).max().unwrap_or(0)
    }
}

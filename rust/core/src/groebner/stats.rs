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
    /// Whether the rows of this step were chosen by the signature criteria.
    pub signatures: bool,
}

/// One line per step, as the benchmark programs print it with `BENCH_VERBOSE`.
impl std::fmt::Display for StepStats {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(
            f,
            "deg {} pairs {} matrix {}x{} nnz {} new {} sym {:.3}s la {:.3}s madds {:.2e}",
            self.degree,
            self.pairs,
            self.rows,
            self.columns,
            self.nonzeros,
            self.new_elements,
            self.seconds_symbolic,
            self.seconds_linear_algebra,
            self.multiply_adds as f64
        )
    }
}

#[derive(Clone, Debug, Default, PartialEq)]
pub struct Stats {
    pub engine: String,
    /// What the automatic engine chose and why (empty for the other engines).
    pub choice: String,
    pub steps: Vec<StepStats>,
    /// Pairs whose S-polynomial reduced to zero (wasted work).
    pub zero_reductions: usize,
    pub seconds: f64,
    /// Highest total degree of a polynomial the engine built or was given: a row of any of its
    /// matrices (the final interreduction's included), an S-polynomial, an input or an output.
    pub highest_degree: u32,
}

impl Stats {
    /// The highest degree of any matrix the run built, inputs and outputs included (see
    /// [`Stats::highest_degree`]): what is often called the solving degree. Step degrees can
    /// differ from it: the signature engine's are the degrees of the homogenized system.
    pub fn max_degree(&self) -> u32 {
        self.highest_degree
    }

    /// The step with the largest matrix (rows × columns); a default step for a run without
    /// steps.
    pub fn largest_step(&self) -> StepStats {
        self.steps
            .iter()
            .max_by_key(|st| st.rows * st.columns)
            .cloned()
            .unwrap_or_default()
    }

    /// Seconds spent in linear algebra, over all steps.
    pub fn seconds_linear_algebra(&self) -> f64 {
        self.steps.iter().map(|st| st.seconds_linear_algebra).sum()
    }

    /// Counts polynomials of degree `degree` as built by the run.
    pub fn reached(&mut self, degree: u32) {
        self.highest_degree = self.highest_degree.max(degree);
    }
}

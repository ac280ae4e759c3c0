//! The widest vector instructions this CPU offers. Builds target the baseline x86-64
//! instruction set; kernels that gain from wider units are compiled again under
//! `#[target_feature]` and the widest one the CPU has is picked at run time.

/// Rows reduced together in one interleaved accumulator: eight 64-bit lanes, one 512-bit
/// register or one cache line per column (the F4 kernels and the characteristic polynomials).
pub const LANES: usize = 8;

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum VectorUnit {
    Baseline,
    #[cfg_attr(not(target_arch = "x86_64"), allow(dead_code))]
    Avx2,
    #[cfg_attr(not(target_arch = "x86_64"), allow(dead_code))]
    Avx512,
}

impl VectorUnit {
    /// The widest unit present (the check is cached by the standard library).
    pub fn detect() -> Self {
        #[cfg(target_arch = "x86_64")]
        {
            if std::arch::is_x86_feature_detected!("avx512f") {
                return VectorUnit::Avx512;
            }
            if std::arch::is_x86_feature_detected!("avx2") {
                return VectorUnit::Avx2;
            }
        }
        VectorUnit::Baseline
    }
}

/// Defines unsafe methods that run the `#[inline(always)]` method `$inner` compiled again with
/// a wider vector unit's target feature (`"avx2" => name`, `"avx512f" => name`), taking
/// `$inner`'s arguments: the same code, which the compiler vectorizes with the wider
/// instructions. The caller picks one with [`VectorUnit::detect`]; each copy's `# Safety` is
/// that the CPU has its feature. Generics go in brackets: `fn inner[S: Scalars](s: &S) -> T`.
#[macro_export]
macro_rules! compiled_for_wider_units {
    (fn $inner:ident $generics:tt $params:tt -> $ret:ty; $($feature:literal => $name:ident),+ $(,)?) => {
        $($crate::compiled_for_wider_units!(@copy $feature $name $inner $generics $params $ret);)+
    };
    (@copy $feature:literal $name:ident $inner:ident [$($g:tt)*] ($($arg:ident: $ty:ty),*) $ret:ty) => {
        #[doc = concat!("`", stringify!($inner), "` compiled with the target feature ", $feature, ".")]
        ///
        /// # Safety
        /// The CPU has that feature.
        #[cfg(target_arch = "x86_64")]
        #[target_feature(enable = $feature)]
        unsafe fn $name<$($g)*>(&self, $($arg: $ty),*) -> $ret {
            self.$inner($($arg),*)
        }
    };
}

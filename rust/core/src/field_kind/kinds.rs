//! The one list of field kinds: every concrete field type with the name of its variant.
//!
//! The core's [`AnyField`](super::AnyField) and the binding's per-kind enums (rings,
//! polynomials, projections, curves) and their dispatch are generated from the list in
//! [`for_each_field_kind!`], so that adding a field kind is: implement [`Field`](crate::field::Field),
//! add one line there, and run the field-axiom battery (`field/tests.rs`) on the new type.

/// Calls the macro `$callback` (a name in scope, or `$crate::name`) with the extra arguments
/// given, then the list of field kinds as `[Variant: Type, ...]` (types as full paths, so the
/// list reads the same in every crate).
#[macro_export]
macro_rules! for_each_field_kind {
    ($($callback:tt)::+ $(, $arg:tt)* $(,)?) => {
        $($callback)::+! { $($arg,)* [
            Prime: $crate::field::PrimeField,
            BigPrime2: $crate::field::BigPrimeField<2>,
            BigPrime4: $crate::field::BigPrimeField<4>,
            BigPrime8: $crate::field::BigPrimeField<8>,
            Table: $crate::extension::TableField,
            Binary: $crate::extension::BinaryField,
            Extension: $crate::extension::ExtensionField,
            Rational: $crate::field::RationalField,
        ] }
    };
}

/// Declares an enum with one variant per field kind: `Variant(Wrapper<Type>)`, or
/// `Variant(Type)` without `of Wrapper`.
#[macro_export]
macro_rules! field_kind_enum {
    ($(#[$meta:meta])* $vis:vis enum $name:ident $(of $wrapper:ident)?) => {
        $crate::for_each_field_kind!(
            $crate::__field_kind_enum,
            ($(#[$meta])* $vis $name $(of $wrapper)?)
        );
    };
}

#[doc(hidden)]
#[macro_export]
macro_rules! __field_kind_enum {
    (($(#[$meta:meta])* $vis:vis $name:ident of $wrapper:ident),
     [$($variant:ident: $ty:ty),* $(,)?]) => {
        $(#[$meta])*
        $vis enum $name {
            $($variant($wrapper<$ty>),)*
        }
    };
    (($(#[$meta:meta])* $vis:vis $name:ident), [$($variant:ident: $ty:ty),* $(,)?]) => {
        $(#[$meta])*
        $vis enum $name {
            $($variant($ty),)*
        }
    };
}

/// Runs `$body` with `$x` bound to the value inside `$value`, a value of the enum `$enum` made
/// by [`field_kind_enum!`] (a name in scope at the call): the body is compiled once per kind.
#[macro_export]
macro_rules! match_field_kind {
    ($enum:ident, $value:expr, $x:ident => $body:expr) => {
        $crate::for_each_field_kind!($crate::__match_field_kind, ($enum, $value, $x, $body))
    };
}

#[doc(hidden)]
#[macro_export]
macro_rules! __match_field_kind {
    (($enum:ident, $value:expr, $x:ident, $body:expr), [$($variant:ident: $ty:ty),* $(,)?]) => {
        match $value {
            $($enum::$variant($x) => $body,)*
        }
    };
}

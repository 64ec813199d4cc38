//! Concrete aliases per precision, so firmware can write `fourforce::f32::Motion`.

/// The example of one alias: it names the generic type in that precision.
macro_rules! alias_example {
    ($t:ident, $name:literal, $args:literal, $path:literal, $more:literal) => {
        concat!(
            "\n# Examples\n```\nuse core::any::TypeId;\nassert_eq!(\n    TypeId::of::<fourforce::",
            stringify!($t),
            "::",
            $name,
            $args,
            ">(),\n    TypeId::of::<fourforce::",
            $path,
            "<",
            stringify!($t),
            $more,
            ">>(),\n);\n```"
        )
    };
}

/// Defines the aliases of every public generic type for one scalar type.
macro_rules! aliases {
    ($t:ident) => {
        use crate::{beamline, check, orbit, push, transfer, witness};

        #[doc = concat!("[`Species`](crate::Species) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Species", "", "Species", "")]
        pub type Species = crate::Species<$t>;
        #[doc = concat!("[`Motion`](crate::Motion) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Motion", "", "Motion", "")]
        pub type Motion = crate::Motion<$t>;
        #[doc = concat!("[`ThreeVector`](crate::ThreeVector) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "ThreeVector", "", "ThreeVector", "")]
        pub type ThreeVector = crate::ThreeVector<$t>;
        #[doc = concat!("[`FourVector`](crate::FourVector) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "FourVector", "", "FourVector", "")]
        pub type FourVector = crate::FourVector<$t>;
        #[doc = concat!("[`Covector`](crate::Covector) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Covector", "", "Covector", "")]
        pub type Covector = crate::Covector<$t>;
        #[doc = concat!("[`FieldTensor`](crate::FieldTensor) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "FieldTensor", "", "FieldTensor", "")]
        pub type FieldTensor = crate::FieldTensor<$t>;
        #[doc = concat!("[`CovariantFieldTensor`](crate::CovariantFieldTensor) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "CovariantFieldTensor", "", "CovariantFieldTensor", "")]
        pub type CovariantFieldTensor = crate::CovariantFieldTensor<$t>;
        #[doc = concat!("[`Boost`](crate::Boost) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Boost", "", "Boost", "")]
        pub type Boost = crate::Boost<$t>;
        #[doc = concat!("[`LorentzTransform`](crate::LorentzTransform) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "LorentzTransform", "", "LorentzTransform", "")]
        pub type LorentzTransform = crate::LorentzTransform<$t>;
        #[doc = concat!("[`Particle`](crate::push::Particle) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Particle", "", "push::Particle", "")]
        pub type Particle = push::Particle<$t>;
        #[doc = concat!("[`Boris`](crate::push::Boris) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Boris", "", "push::Boris", "")]
        pub type Boris = push::Boris<$t>;
        #[doc = concat!("[`Vay`](crate::push::Vay) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Vay", "", "push::Vay", "")]
        pub type Vay = push::Vay<$t>;
        #[doc = concat!("[`HigueraCary`](crate::push::HigueraCary) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "HigueraCary", "", "push::HigueraCary", "")]
        pub type HigueraCary = push::HigueraCary<$t>;
        #[doc = concat!("[`Element`](crate::beamline::Element) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Element", "", "beamline::Element", "")]
        pub type Element = beamline::Element<$t>;
        #[doc = concat!("[`BeamState`](crate::beamline::BeamState) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "BeamState", "", "beamline::BeamState", "")]
        pub type BeamState = beamline::BeamState<$t>;
        #[doc = concat!("[`BeamLine`](crate::beamline::BeamLine) of capacity `N` in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "BeamLine", "<4>", "beamline::BeamLine", ", 4")]
        pub type BeamLine<const N: usize> = beamline::BeamLine<$t, N>;
        #[doc = concat!("[`TransferMap`](crate::transfer::TransferMap) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "TransferMap", "", "transfer::TransferMap", "")]
        pub type TransferMap = transfer::TransferMap<$t>;
        #[doc = concat!("[`Twiss`](crate::transfer::Twiss) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Twiss", "", "transfer::Twiss", "")]
        pub type Twiss = transfer::Twiss<$t>;
        #[doc = concat!("[`Envelope`](crate::transfer::Envelope) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Envelope", "", "transfer::Envelope", "")]
        pub type Envelope = transfer::Envelope<$t>;
        #[doc = concat!("[`CellOptics`](crate::transfer::CellOptics) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "CellOptics", "", "transfer::CellOptics", "")]
        pub type CellOptics = transfer::CellOptics<$t>;
        #[doc = concat!("[`Aperture`](crate::beamline::Aperture) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Aperture", "", "beamline::Aperture", "")]
        pub type Aperture = beamline::Aperture<$t>;
        #[doc = concat!("[`ApertureVerdict`](crate::beamline::ApertureVerdict) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "ApertureVerdict", "", "beamline::ApertureVerdict", "")]
        pub type ApertureVerdict = beamline::ApertureVerdict<$t>;
        #[doc = concat!("[`EnergyWindow`](crate::check::EnergyWindow) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "EnergyWindow", "", "check::EnergyWindow", "")]
        pub type EnergyWindow = check::EnergyWindow<$t>;
        #[doc = concat!("[`Verdict`](crate::check::Verdict) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Verdict", "", "check::Verdict", "")]
        pub type Verdict = check::Verdict<$t>;
        #[doc = concat!("[`MovingWindow`](crate::check::MovingWindow) of capacity `N` in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "MovingWindow", "<4>", "check::MovingWindow", ", 4")]
        pub type MovingWindow<const N: usize> = check::MovingWindow<$t, N>;
        #[doc = concat!("[`Orbit`](crate::orbit::Orbit) of `M` monitors and `C` correctors in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Orbit", "<2, 3>", "orbit::Orbit", ", 2, 3")]
        pub type Orbit<const M: usize, const C: usize> = orbit::Orbit<$t, M, C>;
        #[doc = concat!("[`Response`](crate::orbit::Response) of `M` monitors to `C` correctors in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Response", "<2, 3>", "orbit::Response", ", 2, 3")]
        pub type Response<const M: usize, const C: usize> = orbit::Response<$t, M, C>;
        #[doc = concat!("[`Monitor`](crate::orbit::Monitor) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Monitor", "", "orbit::Monitor", "")]
        pub type Monitor = orbit::Monitor<$t>;
        #[doc = concat!("[`Corrector`](crate::orbit::Corrector) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Corrector", "", "orbit::Corrector", "")]
        pub type Corrector = orbit::Corrector<$t>;
        #[doc = concat!("[`Tuning`](crate::orbit::Tuning) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Tuning", "", "orbit::Tuning", "")]
        pub type Tuning = orbit::Tuning<$t>;
        #[doc = concat!("[`Place`](crate::orbit::Place) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Place", "", "orbit::Place", "")]
        pub type Place = orbit::Place<$t>;
        #[doc = concat!("[`Calibration`](crate::orbit::Calibration) of `P` points in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Calibration", "<4>", "orbit::Calibration", ", 4")]
        pub type Calibration<const P: usize> = orbit::Calibration<$t, P>;
        #[doc = concat!("[`Reading`](crate::witness::Reading) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Reading", "", "witness::Reading", "")]
        pub type Reading = witness::Reading<$t>;
        #[doc = concat!("[`Estimate`](crate::witness::Estimate) in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Estimate", "", "witness::Estimate", "")]
        pub type Estimate = witness::Estimate<$t>;
        #[doc = concat!("[`Watch`](crate::witness::Watch) of capacity `N` in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Watch", "<4>", "witness::Watch", ", 4")]
        pub type Watch<const N: usize> = witness::Watch<$t, N>;
        #[doc = concat!("[`Assessment`](crate::witness::Assessment) of capacity `N` in `", stringify!($t), "`.")]
        #[doc = alias_example!($t, "Assessment", "<4>", "witness::Assessment", ", 4")]
        pub type Assessment<const N: usize> = witness::Assessment<$t, N>;
    };
}

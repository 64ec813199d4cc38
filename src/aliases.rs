//! Concrete aliases per precision, so firmware can write `fourforce::f32::Motion`.

/// Defines the aliases of every public generic type for one scalar type.
macro_rules! aliases {
    ($t:ident) => {
        use crate::{beamline, check, orbit, push, transfer, witness};

        #[doc = concat!("[`Species`](crate::Species) in `", stringify!($t), "`.")]
        pub type Species = crate::Species<$t>;
        #[doc = concat!("[`Motion`](crate::Motion) in `", stringify!($t), "`.")]
        pub type Motion = crate::Motion<$t>;
        #[doc = concat!("[`ThreeVector`](crate::ThreeVector) in `", stringify!($t), "`.")]
        pub type ThreeVector = crate::ThreeVector<$t>;
        #[doc = concat!("[`FourVector`](crate::FourVector) in `", stringify!($t), "`.")]
        pub type FourVector = crate::FourVector<$t>;
        #[doc = concat!("[`Covector`](crate::Covector) in `", stringify!($t), "`.")]
        pub type Covector = crate::Covector<$t>;
        #[doc = concat!("[`FieldTensor`](crate::FieldTensor) in `", stringify!($t), "`.")]
        pub type FieldTensor = crate::FieldTensor<$t>;
        #[doc = concat!("[`CovariantFieldTensor`](crate::CovariantFieldTensor) in `", stringify!($t), "`.")]
        pub type CovariantFieldTensor = crate::CovariantFieldTensor<$t>;
        #[doc = concat!("[`Boost`](crate::Boost) in `", stringify!($t), "`.")]
        pub type Boost = crate::Boost<$t>;
        #[doc = concat!("[`LorentzTransform`](crate::LorentzTransform) in `", stringify!($t), "`.")]
        pub type LorentzTransform = crate::LorentzTransform<$t>;
        #[doc = concat!("[`Particle`](crate::push::Particle) in `", stringify!($t), "`.")]
        pub type Particle = push::Particle<$t>;
        #[doc = concat!("[`Boris`](crate::push::Boris) in `", stringify!($t), "`.")]
        pub type Boris = push::Boris<$t>;
        #[doc = concat!("[`Vay`](crate::push::Vay) in `", stringify!($t), "`.")]
        pub type Vay = push::Vay<$t>;
        #[doc = concat!("[`HigueraCary`](crate::push::HigueraCary) in `", stringify!($t), "`.")]
        pub type HigueraCary = push::HigueraCary<$t>;
        #[doc = concat!("[`Element`](crate::beamline::Element) in `", stringify!($t), "`.")]
        pub type Element = beamline::Element<$t>;
        #[doc = concat!("[`BeamState`](crate::beamline::BeamState) in `", stringify!($t), "`.")]
        pub type BeamState = beamline::BeamState<$t>;
        #[doc = concat!("[`BeamLine`](crate::beamline::BeamLine) of capacity `N` in `", stringify!($t), "`.")]
        pub type BeamLine<const N: usize> = beamline::BeamLine<$t, N>;
        #[doc = concat!("[`TransferMap`](crate::transfer::TransferMap) in `", stringify!($t), "`.")]
        pub type TransferMap = transfer::TransferMap<$t>;
        #[doc = concat!("[`Twiss`](crate::transfer::Twiss) in `", stringify!($t), "`.")]
        pub type Twiss = transfer::Twiss<$t>;
        #[doc = concat!("[`Envelope`](crate::transfer::Envelope) in `", stringify!($t), "`.")]
        pub type Envelope = transfer::Envelope<$t>;
        #[doc = concat!("[`CellOptics`](crate::transfer::CellOptics) in `", stringify!($t), "`.")]
        pub type CellOptics = transfer::CellOptics<$t>;
        #[doc = concat!("[`Aperture`](crate::beamline::Aperture) in `", stringify!($t), "`.")]
        pub type Aperture = beamline::Aperture<$t>;
        #[doc = concat!("[`ApertureVerdict`](crate::beamline::ApertureVerdict) in `", stringify!($t), "`.")]
        pub type ApertureVerdict = beamline::ApertureVerdict<$t>;
        #[doc = concat!("[`EnergyWindow`](crate::check::EnergyWindow) in `", stringify!($t), "`.")]
        pub type EnergyWindow = check::EnergyWindow<$t>;
        #[doc = concat!("[`Verdict`](crate::check::Verdict) in `", stringify!($t), "`.")]
        pub type Verdict = check::Verdict<$t>;
        #[doc = concat!("[`MovingWindow`](crate::check::MovingWindow) of capacity `N` in `", stringify!($t), "`.")]
        pub type MovingWindow<const N: usize> = check::MovingWindow<$t, N>;
        #[doc = concat!("[`Orbit`](crate::orbit::Orbit) of `M` monitors and `C` correctors in `", stringify!($t), "`.")]
        pub type Orbit<const M: usize, const C: usize> = orbit::Orbit<$t, M, C>;
        #[doc = concat!("[`Response`](crate::orbit::Response) of `M` monitors to `C` correctors in `", stringify!($t), "`.")]
        pub type Response<const M: usize, const C: usize> = orbit::Response<$t, M, C>;
        #[doc = concat!("[`Monitor`](crate::orbit::Monitor) in `", stringify!($t), "`.")]
        pub type Monitor = orbit::Monitor<$t>;
        #[doc = concat!("[`Corrector`](crate::orbit::Corrector) in `", stringify!($t), "`.")]
        pub type Corrector = orbit::Corrector<$t>;
        #[doc = concat!("[`Tuning`](crate::orbit::Tuning) in `", stringify!($t), "`.")]
        pub type Tuning = orbit::Tuning<$t>;
        #[doc = concat!("[`Place`](crate::orbit::Place) in `", stringify!($t), "`.")]
        pub type Place = orbit::Place<$t>;
        #[doc = concat!("[`Calibration`](crate::orbit::Calibration) of `P` points in `", stringify!($t), "`.")]
        pub type Calibration<const P: usize> = orbit::Calibration<$t, P>;
        #[doc = concat!("[`Reading`](crate::witness::Reading) in `", stringify!($t), "`.")]
        pub type Reading = witness::Reading<$t>;
        #[doc = concat!("[`Estimate`](crate::witness::Estimate) in `", stringify!($t), "`.")]
        pub type Estimate = witness::Estimate<$t>;
        #[doc = concat!("[`Watch`](crate::witness::Watch) of capacity `N` in `", stringify!($t), "`.")]
        pub type Watch<const N: usize> = witness::Watch<$t, N>;
        #[doc = concat!("[`Assessment`](crate::witness::Assessment) of capacity `N` in `", stringify!($t), "`.")]
        pub type Assessment<const N: usize> = witness::Assessment<$t, N>;
    };
}

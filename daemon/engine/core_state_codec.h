// Encoding of the core estimators' State snapshots with StateWriter / StateReader.
//
// One put/get pair per State type; get() returns the reader's ok() after reading, and a vector
// length read back must match the estimator's dimension (checked by the caller through the
// returned sizes). Field order is the order of the struct's members: a change to a core State
// struct must be mirrored here and the saving class's version byte bumped.
#pragma once

#include "core/cusum.h"
#include "core/ewma.h"
#include "core/episode.h"
#include "core/ewma_chart.h"
#include "core/filter_life.h"
#include "core/hall_integral.h"
#include "core/linear_fit.h"
#include "core/rls.h"
#include "core/running_stats.h"
#include "core/trend.h"
#include "engine/state_codec.h"

namespace bw::engine {

void put(StateWriter& out, const core::SampleGate::State& s);
void put(StateWriter& out, const core::Ewma::State& s);
void put(StateWriter& out, const core::EwmaChart::State& s);
void put(StateWriter& out, const core::Cusum::State& s);
void put(StateWriter& out, const core::Rls::State& s);
void put(StateWriter& out, const core::LinearTrend::State& s);
void put(StateWriter& out, const core::RunningStats::State& s);
void put(StateWriter& out, const core::WeightedLinearFit::State& s);
void put(StateWriter& out, const core::HallPlot::State& s);
void put(StateWriter& out, const core::FilterLife::State& s);
void put(StateWriter& out, const core::Episode::State& s);

bool get(StateReader& in, core::SampleGate::State& s);
bool get(StateReader& in, core::Ewma::State& s);
bool get(StateReader& in, core::EwmaChart::State& s);
bool get(StateReader& in, core::Cusum::State& s);
bool get(StateReader& in, core::Rls::State& s);
bool get(StateReader& in, core::LinearTrend::State& s);
bool get(StateReader& in, core::RunningStats::State& s);
bool get(StateReader& in, core::WeightedLinearFit::State& s);
bool get(StateReader& in, core::HallPlot::State& s);
bool get(StateReader& in, core::FilterLife::State& s);
bool get(StateReader& in, core::Episode::State& s);

}  // namespace bw::engine

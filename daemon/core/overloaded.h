// Builds one visitor for std::visit from several lambdas.
#pragma once

namespace bw::core {

template <class... Fs>
struct Overloaded : Fs... {
  using Fs::operator()...;
};
template <class... Fs>
Overloaded(Fs...) -> Overloaded<Fs...>;

}  // namespace bw::core

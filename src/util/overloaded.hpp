// An overload set of lambdas for std::visit: a visit that lacks the lambda for one
// alternative does not compile, which is how every kind of step is known to be handled.
#pragma once

namespace deltag {

template <class... F>
struct Overloaded : F... {
    using F::operator()...;
};
template <class... F>
Overloaded(F...) -> Overloaded<F...>;

}  // namespace deltag

// The store's failure: whatever the backend, an operation that could not be
// done (nothing half-done is left behind).
#pragma once

#include <stdexcept>

namespace strandline::store {

class StoreError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

}  // namespace strandline::store

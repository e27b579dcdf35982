// The store's failure: whatever the backend, an operation that could not be
// done (nothing half-done is left behind).
#pragma once

#include <stdexcept>

namespace strandline::store {

class StoreError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

// No room to write (a full disk, or the size limit set for the database): the
// operation was rolled back and the store is as it was before it.
class StorageFull : public StoreError {
 public:
  using StoreError::StoreError;
};

}  // namespace strandline::store

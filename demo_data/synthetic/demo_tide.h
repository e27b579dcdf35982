// The demo site's harmonic constants (invented: a mixed, mainly semidiurnal tide
// of ~2 m spring range with 3 mm/yr of mean-level rise), and site parameters that
// generate the demo with that tide. Shared by the demo program and the service's
// demo site so both see one site.
#pragma once

#include "corrections/tide/constituent_set.h"
#include "demo_data/synthetic/synthetic_site.h"

namespace strandline::synthetic {

tide::ConstituentSet demo_tide_constituents();

// SiteParams::defaults() with the tide replaced by the harmonic prediction
// (nodal corrections) of demo_tide_constituents().
SiteParams demo_site_params();

}  // namespace strandline::synthetic

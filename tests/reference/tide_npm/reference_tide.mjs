// Reference side of check_tide_npm.py: reads one JSON request on stdin and
// answers on stdout with @neaps/tide-predictor (Schureman node corrections) and
// station constants from @neaps/tide-database.
//   {"mode": "stations", "per_regime": N}      -> stations picked by tidal regime
//   {"mode": "predict", "constituents": [...], "start": ISO, "end": ISO, "step_s": S}
//   {"mode": "nodal", "names": [...], "times": [ISO...]}  -> f and V + u per time and name,
//     read off unit-amplitude predictions with phase lags 0 and 90 deg
//   {"mode": "known", "names": [...]}          -> which names the predictor knows
import { createTidePredictor, constituents } from "@neaps/tide-predictor";
import { stations } from "@neaps/tide-database";

const input = JSON.parse(await new Promise((resolve) => {
  let text = "";
  process.stdin.on("data", (chunk) => (text += chunk));
  process.stdin.on("end", () => resolve(text));
}));

function amplitude(station, name) {
  const c = station.harmonic_constituents.find((k) => k.name.toUpperCase() === name);
  return c ? c.amplitude : 0;
}

// Form factor F = (K1 + O1) / (M2 + S2): < 0.25 semidiurnal, 0.25-1.5 mixed
// mainly semidiurnal, 1.5-3 mixed mainly diurnal, > 3 diurnal (common practice).
function regime(f) {
  if (f < 0.25) return "semidiurnal";
  if (f <= 3.0) return "mixed";
  return "diurnal";
}

function pickStations(perRegime) {
  const candidates = stations
    .filter((s) => s.type === "reference" && s.harmonic_constituents.length >= 20)
    .map((s) => {
      const semi = amplitude(s, "M2") + amplitude(s, "S2");
      const diu = amplitude(s, "K1") + amplitude(s, "O1");
      return { s, f: semi > 0 ? diu / semi : Infinity, range: semi + diu };
    })
    .filter((c) => Number.isFinite(c.f) && c.range > 0.3)
    .sort((a, b) => (a.s.id < b.s.id ? -1 : 1));
  const out = [];
  for (const name of ["semidiurnal", "mixed", "diurnal"]) {
    const group = candidates.filter((c) => regime(c.f) === name);
    // Spread over sources and the alphabet: every k-th station of the sorted group.
    const bySource = new Map();
    for (const c of group) {
      const key = c.s.source.name;
      if (!bySource.has(key)) bySource.set(key, []);
      bySource.get(key).push(c);
    }
    const picked = [];
    const sources = [...bySource.keys()].sort();
    for (let round = 0; picked.length < perRegime && round < perRegime; ++round)
      for (const src of sources) {
        const list = bySource.get(src);
        const k = Math.floor(((round + 0.5) * list.length) / perRegime);
        if (k < list.length && picked.length < perRegime && !picked.includes(list[k])) picked.push(list[k]);
      }
    for (const c of picked)
      out.push({
        id: c.s.id,
        name: c.s.name,
        country: c.s.country,
        source: c.s.source.name,
        regime: name,
        form_factor: c.f,
        constituents: c.s.harmonic_constituents.map((k) => ({ name: k.name, amplitude: k.amplitude, phase: k.phase })),
      });
  }
  return out;
}

let output;
if (input.mode === "stations") {
  output = pickStations(input.per_regime);
} else if (input.mode === "known") {
  output = Object.fromEntries(input.names.map((n) => [n, constituents[n] ? constituents[n].name : null]));
} else if (input.mode === "predict") {
  const predictor = createTidePredictor(input.constituents, { nodeCorrections: "schureman" });
  const timeline = predictor.getTimelinePrediction({
    start: new Date(input.start),
    end: new Date(input.end),
    timeFidelity: input.step_s,
  });
  output = { times: timeline.map((p) => p.time.toISOString()), levels: timeline.map((p) => p.level) };
} else if (input.mode === "nodal") {
  const level = (name, phase, time) =>
    createTidePredictor([{ name, amplitude: 1, phase }], { nodeCorrections: "schureman" })
      .getWaterLevelAtTime({ time: new Date(time) }).level;
  output = input.times.map((t) => {
    const row = {};
    for (const n of input.names) {
      const c = level(n, 0, t);   // f cos(V + u)
      const s = level(n, 90, t);  // f sin(V + u)
      row[n] = { f: Math.hypot(c, s), v_plus_u_deg: (Math.atan2(s, c) * 180) / Math.PI };
    }
    return row;
  });
} else {
  throw new Error("unknown mode " + input.mode);
}
process.stdout.write(JSON.stringify(output));

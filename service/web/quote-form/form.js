// Example quotation form for the Faultpath API: plain JavaScript, no libraries, no build step.
// To call a Faultpath service on another origin, set API_BASE to its address (the service must list
// this page's origin in FAULTPATH_CORS_ORIGINS) and API_KEY to a key it accepts.
"use strict";
const API_BASE = "";
const API_KEY = "";

const byId = (id) => document.getElementById(id);
const number = (id) => { const v = byId(id).value.trim(); return v === "" ? undefined : Number(v); };

function headers() {
  const h = {"Content-Type": "application/json", "Accept": "application/json"};
  if (API_KEY) h["X-API-Key"] = API_KEY;
  return h;
}

async function call(path, body, accept) {
  const h = headers();
  if (accept) h["Accept"] = accept;
  const response = await fetch(API_BASE + path, {method: "POST", headers: h, body: JSON.stringify(body)});
  const type = response.headers.get("Content-Type") || "";
  if (!response.ok) {
    const problem = type.includes("json") ? await response.json() : {title: response.statusText, errors: []};
    const error = new Error(problem.detail || problem.title);
    error.problem = problem;
    throw error;
  }
  return type.includes("svg") ? response.blob() : response.json();
}

function supply() {
  return {earthing: byId("earthing").value, u0_v: number("u0"), ze_ohm: number("ze"), prospective_fault_current_ka: number("pfc")};
}

function device() {
  const [standard, type] = byId("family").value.split("|");
  const d = {standard: standard, type: type};
  const icn = number("icn");
  if (icn !== undefined) d.breaking_capacity_ka = icn;
  if (standard === "BS EN 61009") d.rcd = {residual_current_ma: 30, type: "A"};
  return d;
}

// The device the sizing chose: its rating, and the RCD or AFDD the rules call for where it added one.
function chosenDevice(chosen) {
  const d = Object.assign(device(), {rating_a: chosen.rating_a});
  if (chosen.rcd) d.rcd = {residual_current_ma: chosen.rcd.residual_current_ma, delay: chosen.rcd.delay, type: chosen.rcd.type};
  if (chosen.afdd !== null) d.afdd = chosen.afdd;
  return d;
}

function sizeRequest() {
  return {
    supply: supply(), premises: byId("premises").value, id: "quote", role: "final", load: byId("load").value,
    use: byId("use").value, location: byId("location").value,
    design_current_a: number("current"), length_m: number("length"),
    installation: {cable: byId("cable").value, installation_method: byId("method").value, ambient_c: number("ambient"),
                   concealed_in_wall: byId("concealed").value},
    device: device(),
  };
}

function clearErrors() {
  document.querySelectorAll(".field-error").forEach((e) => { e.textContent = ""; });
  document.querySelectorAll("[aria-invalid]").forEach((e) => e.removeAttribute("aria-invalid"));
}

// Show each problem+json error next to the field its pointer names (or the closest enclosing one).
function showProblem(problem, prefix) {
  const fields = Array.from(document.querySelectorAll("[data-pointer]"));
  let shown = 0;
  for (const err of problem.errors || []) {
    let pointer = err.pointer.startsWith(prefix) ? err.pointer.slice(prefix.length) : err.pointer;
    const field = fields.find((f) => f.dataset.pointer === pointer) ||
                  fields.find((f) => pointer.startsWith(f.dataset.pointer + "/") || f.dataset.pointer.startsWith(pointer + "/"));
    if (field) {
      field.setAttribute("aria-invalid", "true");
      const slot = byId(field.getAttribute("aria-describedby"));
      slot.textContent = (slot.textContent ? slot.textContent + " " : "") + err.message;
      shown += 1;
    }
  }
  byId("status").textContent = (problem.detail || problem.title || "The request was refused.") + (shown ? " See the marked fields." : "");
}

function text(value, unit) {
  if (value === null || value === undefined) return "-";
  return (Math.abs(value) >= 100 ? value.toFixed(0) : value.toPrecision(3)) + (unit ? " " + unit : "");
}

function render(size, check, svg) {
  const sel = size.selected;
  const rcd = size.device.rcd ? `, with a ${size.device.rcd.residual_current_ma} mA RCD of type ${size.device.rcd.type}` : "";
  const afdd = size.device.afdd ? ", with an AFDD" : "";
  byId("price-device").textContent = `${size.device.standard} type ${size.device.type} ${size.device.rating_a} A${rcd}${afdd}`;
  byId("price-cable").textContent = `${sel.line_csa_mm2} mm² line, ${sel.cpc_csa_mm2} mm² cpc (${byId("cable").selectedOptions[0].textContent}), Iz ${text(sel.capacity.iz_a, "A")}, voltage drop ${text(sel.voltage_drop.percent, "%")}`;
  const reach = size.max_length;
  byId("price-reach").textContent = reach && reach.max_length_m ? `${text(reach.max_length_m, "m")} (limited by ${reach.limited_by})` : "-";
  const verdict = byId("verdict");
  verdict.textContent = `Verdict: ${check.verdict}`;
  verdict.className = "verdict " + check.verdict;
  const body = byId("checks").querySelector("tbody");
  body.replaceChildren();
  for (const c of check.checks) {
    const row = document.createElement("tr");
    for (const cell of [c.check, c.verdict, text(c.value, c.unit), text(c.limit, c.unit), c.basis]) {
      const td = document.createElement("td");
      td.textContent = cell;
      row.appendChild(td);
    }
    body.appendChild(row);
  }
  const tried = byId("tried");
  tried.replaceChildren();
  for (const t of size.tried) {
    const li = document.createElement("li");
    li.textContent = `${t.line_csa_mm2} mm²: ruled out by ${t.ruled_out_by} (${text(t.value, t.unit)} against ${text(t.limit, t.unit)})`;
    tried.appendChild(li);
  }
  if (!size.tried.length) tried.innerHTML = "<li>none: the smallest size passes</li>";
  byId("picture").src = URL.createObjectURL(svg);
  const cautions = byId("cautions");
  cautions.replaceChildren();
  for (const c of new Set([...check.cautions, ...size.cautions])) {
    const li = document.createElement("li");
    li.textContent = c;
    cautions.appendChild(li);
  }
  byId("result").hidden = false;
}

byId("quote").addEventListener("submit", async (event) => {
  event.preventDefault();
  clearErrors();
  byId("result").hidden = true;
  byId("status").textContent = "Sizing…";
  try {
    const size = await call("/v1/circuits/size", sizeRequest());
    if (!size.selected) {
      byId("status").textContent = "No tabulated size passes every check for this load and run: " + size.tried.map((t) => `${t.line_csa_mm2} mm² (${t.ruled_out_by})`).join(", ");
      return;
    }
    const circuit = {
      id: "quote", role: "final", load: byId("load").value, design_current_a: size.design_current_a,
      device: chosenDevice(size.device), location: byId("location").value,
      conductors: {material: size.selected.material, insulation: size.selected.insulation,
                   line_csa_mm2: size.selected.line_csa_mm2, cpc_csa_mm2: size.selected.cpc_csa_mm2, length_m: number("length")},
      installation: sizeRequest().installation,
    };
    byId("status").textContent = "Checking…";
    const body = {premises: byId("premises").value, supply: supply(), circuit: circuit};
    const check = await call("/v1/circuits/check", body);
    const svg = await call("/v1/circuits/picture", body, "image/svg+xml");
    render(size, check, svg);
    byId("status").textContent = "Done.";
  } catch (error) {
    if (error.problem) showProblem(error.problem, "");
    else byId("status").textContent = "The service could not be reached: " + error.message;
  }
});

// The live view: the camera's analysis picture, a zone drawn with the mouse, its heading, a live chart of
// its moving share and against share, and the TOML snippet for it. Plain script, no build step.
"use strict";
const camera = decodeURIComponent(location.pathname.split("/")[2] || "");
const token = new URLSearchParams(location.search).get("access_token");
const auth = token ? "access_token=" + encodeURIComponent(token) : "";
const withAuth = (url) => auth ? url + (url.includes("?") ? "&" : "?") + auth : url;

const picture = document.getElementById("picture");
const draw = document.getElementById("draw");
const chart = document.getElementById("chart");
const toml = document.getElementById("toml");
const zoneId = document.getElementById("zone-id");
const existing = document.getElementById("existing");
document.getElementById("title").textContent = "wayward — " + camera;
// one picture after the other (the MJPEG stream /live/<camera>.mjpeg serves other viewers); the next is asked
// for once the last has arrived, so a slow link gets fewer, not stale, pictures
function nextPicture() {
  picture.src = withAuth("/live/" + encodeURIComponent(camera) + ".jpg?t=" + Date.now());
}
picture.addEventListener("load", () => setTimeout(nextPicture, 200));
picture.addEventListener("error", () => setTimeout(nextPicture, 1000));
nextPicture();

// the zone being drawn, corners as fractions of the picture (0..1), heading in degrees clockwise from up
let points = [];
let closed = false;
let heading = null;
let press = null;
let drag = null;
const series = [];
let zones = [];

function size() {
  const w = picture.clientWidth, h = picture.clientHeight;
  if (draw.width !== w || draw.height !== h) { draw.width = w; draw.height = h; }
  return [w, h];
}

function at(ev) {
  const r = draw.getBoundingClientRect();
  return [(ev.clientX - r.left) / r.width, (ev.clientY - r.top) / r.height];
}

function centroid() {
  let x = 0, y = 0;
  for (const p of points) { x += p[0]; y += p[1]; }
  return [x / points.length, y / points.length];
}

// screen bearing of a drag: 0 = up, 90 = right (the config's convention)
function bearing(dx, dy) {
  let b = Math.atan2(dx, -dy) * 180 / Math.PI;
  b = Math.round(b);
  return ((b % 360) + 360) % 360;
}

// pressing on a corner of a closed zone moves that corner; pressing elsewhere drags the heading
let corner = -1;
function cornerAt(p) {
  const [w, h] = size();
  return points.findIndex(q => Math.hypot((q[0] - p[0]) * w, (q[1] - p[1]) * h) < 8);
}
draw.addEventListener("mousedown", (ev) => {
  press = at(ev); drag = null;
  corner = closed ? cornerAt(press) : -1;
});
draw.addEventListener("mousemove", (ev) => {
  if (!press || !closed) return;
  const p = at(ev);
  if (corner >= 0) {
    points[corner] = [Math.min(1, Math.max(0, p[0])), Math.min(1, Math.max(0, p[1]))];
    snippet();
  } else {
    drag = p;
  }
});
draw.addEventListener("mouseup", (ev) => {
  const p = at(ev);
  const [w, h] = size();
  const moved = press ? Math.hypot((p[0] - press[0]) * w, (p[1] - press[1]) * h) : 0;
  if (corner >= 0) {
    corner = -1;
  } else if (closed && moved > 8) {
    heading = bearing((p[0] - press[0]) * w, (p[1] - press[1]) * h);
  } else if (!closed) {
    if (points.length >= 3) {
      const first = points[0];
      if (Math.hypot((p[0] - first[0]) * w, (p[1] - first[1]) * h) < 10) {
        closed = true;
      }
    }
    if (!closed) points.push([Math.min(1, Math.max(0, p[0])), Math.min(1, Math.max(0, p[1]))]);
  }
  press = null;
  drag = null;
  snippet();
});
document.getElementById("restart").addEventListener("click", () => {
  points = []; closed = false; heading = null; series.length = 0; snippet();
});
// start from a configured zone: its corners and heading, to move and turn
document.getElementById("edit").addEventListener("click", () => {
  const z = zones.find(z => z.id === existing.value);
  if (!z) return;
  points = z.polygon.map(p => [p[0], p[1]]);
  closed = true;
  heading = z.heading_deg === undefined ? null : z.heading_deg;
  zoneId.value = z.id;
  series.length = 0;
  snippet();
});
zoneId.addEventListener("input", snippet);
document.getElementById("copy").addEventListener("click", () => navigator.clipboard.writeText(toml.textContent));

const fmt = (v) => (Math.round(v * 100) / 100).toFixed(2);

function snippet() {
  if (!closed) {
    toml.textContent = points.length ? "(" + points.length + " corners; click the first one to close the zone)" : "";
    return;
  }
  const lines = [
    "[[camera.zone]]",
    "id = \"" + zoneId.value.replace(/[^a-z0-9._-]/g, "-") + "\"",
    "polygon = [" + points.map(p => "[" + fmt(p[0]) + ", " + fmt(p[1]) + "]").join(", ") + "]",
  ];
  if (heading !== null) lines.push("heading_deg = " + heading);
  toml.textContent = lines.join("\n") + "\n";
}

function render() {
  const [w, h] = size();
  const g = draw.getContext("2d");
  g.clearRect(0, 0, w, h);
  // the drawn zone in black and white only: every hue means a direction on the colour wheel
  if (points.length) {
    g.fillStyle = "rgba(255, 255, 255, 0.15)";
    g.beginPath();
    points.forEach((p, i) => i ? g.lineTo(p[0] * w, p[1] * h) : g.moveTo(p[0] * w, p[1] * h));
    if (closed) { g.closePath(); g.fill(); }
    for (const [width, colour] of [[4, "#000"], [2, "#fff"]]) { g.lineWidth = width; g.strokeStyle = colour; g.stroke(); }
    for (const p of points) {
      g.fillStyle = "#000"; g.fillRect(p[0] * w - 4, p[1] * h - 4, 8, 8);
      g.fillStyle = "#fff"; g.fillRect(p[0] * w - 3, p[1] * h - 3, 6, 6);
    }
  }
  let b = heading;
  if (drag && press) b = bearing((drag[0] - press[0]) * w, (drag[1] - press[1]) * h);
  if (closed && b !== null) {
    const [cx, cy] = centroid();
    const a = b * Math.PI / 180, len = 40;
    const x0 = cx * w, y0 = cy * h, x1 = x0 + len * Math.sin(a), y1 = y0 - len * Math.cos(a);
    g.beginPath(); g.moveTo(x0, y0); g.lineTo(x1, y1);
    for (const s of [-0.5, 0.5]) {
      const back = Math.atan2(y1 - y0, x1 - x0);
      g.moveTo(x1, y1); g.lineTo(x1 - 12 * Math.cos(back + s), y1 - 12 * Math.sin(back + s));
    }
    for (const [width, colour] of [[5, "#000"], [3, "#fff"]]) { g.lineWidth = width; g.strokeStyle = colour; g.stroke(); }
  }
  requestAnimationFrame(render);
}
requestAnimationFrame(render);

async function poll() {
  const sample = { moving_share: null, against_share: null, other: null, onset: null };
  try {
    if (closed) {
      const poly = points.map(p => p[0].toFixed(4) + "," + p[1].toFixed(4)).join(";");
      const url = "/api/measure?camera=" + encodeURIComponent(camera) + "&polygon=" + encodeURIComponent(poly)
        + (heading !== null ? "&heading=" + heading : "");
      const m = await (await fetch(withAuth(url))).json();
      sample.moving_share = m.moving_share; sample.against_share = m.against_share;
    }
    const cams = await (await fetch(withAuth("/api/cameras"))).json();
    const cam = cams.cameras.find(c => c.id === camera);
    if (cam) {
      // each stream: its config key, size, what it is used for, counters and health
      document.getElementById("streams").textContent = cam.streams.map(st => st.stream + " "
        + (st.width ? st.width + "x" + st.height : "size not known yet") + " ("
        + (st.decoded ? "analysed, " + st.frames_in + " frames" : "clips only, " + st.packets_in + " packets")
        + ", " + st.reconnects + " reconnects, " + st.state + ")").join(" · ");
      if (zones.length !== cam.zones.length) {
        zones = cam.zones;
        for (const z of zones) {
          const o = document.createElement("option"); o.value = z.id; o.textContent = z.id; existing.appendChild(o);
        }
      }
      showMutes(cam);
      const z = cam.zones.find(z => z.id === existing.value);
      if (z) { sample.other = z.against_share; sample.onset = z.onset_level; }
    }
  } catch (e) {
    // the service restarts or the network hiccups: keep polling
  }
  series.push(sample);
  if (series.length > 120) series.shift();
  plot();
}
setInterval(poll, 500);

function plot() {
  const g = chart.getContext("2d"), w = chart.width, h = chart.height;
  g.clearRect(0, 0, w, h);
  g.strokeStyle = "#ccc"; g.lineWidth = 1; g.strokeRect(0.5, 0.5, w - 1, h - 1);
  let top = 0.05;
  for (const s of series) for (const k of ["moving_share", "against_share", "other", "onset"]) if (s[k] > top) top = s[k];
  top *= 1.1;
  g.fillStyle = "#666"; g.font = "11px sans-serif"; g.fillText(top.toFixed(3), 4, 12); g.fillText("0", 4, h - 4);
  const line = (key, colour, dash) => {
    g.strokeStyle = colour; g.setLineDash(dash); g.lineWidth = 2; g.beginPath();
    let started = false;
    series.forEach((s, i) => {
      if (s[key] === null || s[key] === undefined) { started = false; return; }
      const x = w - (series.length - 1 - i) * (w / 120), y = h - (s[key] / top) * h;
      started ? g.lineTo(x, y) : g.moveTo(x, y); started = true;
    });
    g.stroke(); g.setLineDash([]);
  };
  line("moving_share", "#2a6fd6", []);
  line("against_share", "#d62a2a", []);
  line("other", "#888", []);
  line("onset", "#888", [4, 4]);
}

// mutes: shown from /api/cameras; set with POST and the page's token in the Authorization header
const muteWhat = document.getElementById("mute-what");
function showMutes(cam) {
  if (muteWhat.options.length === 1) {
    for (const z of cam.zones) {
      const o = document.createElement("option"); o.value = z.id; o.textContent = "zone " + z.id; muteWhat.appendChild(o);
    }
  }
  const said = [];
  const one = (what, m) => what + " until " + new Date(m.until).toLocaleString() + " by " + m.by
    + (m.reason ? " (" + m.reason + ")" : "");
  if (cam.muted) said.push(one("the whole camera", cam.muted));
  for (const z of cam.zones) if (z.muted) said.push(one("zone " + z.id, z.muted));
  document.getElementById("mute-state").textContent = "Muted: " + (said.length ? said.join("; ") : "nothing") + ".";
}
async function changeMute(path, body) {
  const out = document.getElementById("mute-said");
  try {
    const r = await fetch(path, { method: "POST", headers: { "Content-Type": "application/json",
      "Authorization": "Bearer " + (token || "") }, body: JSON.stringify(body) });
    out.textContent = r.ok ? (path.endsWith("/end") ? "Mute ended." : "Muted.") : "Refused: " + (await r.text());
  } catch (e) {
    out.textContent = "Not sent: " + e;
  }
}
document.getElementById("mute").onclick = () => {
  const body = { camera: camera, minutes: Number(document.getElementById("mute-minutes").value),
    reason: document.getElementById("mute-reason").value };
  if (muteWhat.value) body.zone = muteWhat.value;
  changeMute("/api/mutes", body);
};
document.getElementById("unmute").onclick = () => {
  const body = { camera: camera, reason: document.getElementById("mute-reason").value };
  if (muteWhat.value) body.zone = muteWhat.value;
  changeMute("/api/mutes/end", body);
};

// for tests and scripts: the snippet as shown
window.waywardSnippet = () => toml.textContent;

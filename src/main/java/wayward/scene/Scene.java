package wayward.scene;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.tomlj.Toml;
import org.tomlj.TomlArray;
import org.tomlj.TomlParseResult;
import org.tomlj.TomlTable;

/**
 * A scenario for {@link SceneGenerator}, read from a scene TOML file (see test-streams/*.scene.toml). All
 * positions are fractions of the frame (x right, y down); times are seconds from the first frame.
 */
public record Scene(String name, int width, int height, double fps, double seconds, long seed, double noise,
        int bitrateKbps, List<Line> lines, List<Zone> zones, List<Mover> movers, Nuisances nuisances) {

    /** What a real camera adds besides traffic; all optional, none by default. */
    public record Nuisances(List<Light> lights, double shakePx, double shakeHz, Bump bump, Rain rain,
            List<Sway> sways, Shadow shadow, Tamper tamper) {
        public static final Nuisances NONE = new Nuisances(List.of(), 0, 0, null, null, List.of(), null, null);
    }

    /**
     * From {@code atSeconds}: "cover" (the lens covered: a flat grey picture with noise), "freeze" (the very same
     * picture again and again) or "blur" (out of focus: a wide box blur).
     */
    public record Tamper(String kind, double atSeconds) {
        /** The event kind a watcher should raise for it. */
        public String expectedEvent() {
            return switch (kind) {
                case "cover" -> "view_blocked";
                case "freeze" -> "picture_frozen";
                case "blur" -> "focus_lost";
                default -> throw new IllegalArgumentException("tamper kind " + kind);
            };
        }
    }

    /** From {@code atSeconds}, over {@code rampSeconds}, the picture's brightness goes to v·gain + offset. */
    public record Light(double atSeconds, double rampSeconds, double gain, double offset) {
    }

    /** The camera is knocked at {@code atSeconds} and stays moved by (dx, dy) pixels. */
    public record Bump(double atSeconds, double dxPx, double dyPx) {
    }

    /** Bright streaks at random places every frame: rain or snow in front of the lens. */
    public record Rain(int streaksPerFrame, double lengthPx, double angleDeg, double brightness) {
    }

    /** A textured patch (vegetation) swinging back and forth along {@code angleDeg}. */
    public record Sway(double x, double y, double width, double height, double amplitudePx, double periodSeconds,
            double angleDeg) {
    }

    /** A soft dark band sweeping across the picture from {@code fromX} to {@code toX} (fractions). */
    public record Shadow(double startSeconds, double endSeconds, double fromX, double toX, double width,
            double darkness) {
    }

    /** A painted line on the ground; dashPx 0 = solid. */
    public record Line(double x0, double y0, double x1, double y1, double widthPx, double dashPx) {
    }

    /** A zone as the ground truth sees it (same polygon and heading as in the camera config). */
    public record Zone(String id, double[] xs, double[] ys, double headingDeg, double toleranceDeg) {
        public boolean contains(double x, double y) {
            boolean in = false;
            for (int i = 0, j = xs.length - 1; i < xs.length; j = i++) {
                if ((ys[i] > y) != (ys[j] > y) && x < xs[j] + (y - ys[j]) * (xs[i] - xs[j]) / (ys[i] - ys[j])) {
                    in = !in;
                }
            }
            return in;
        }

        /** True when a bearing lies within the tolerance of the opposite of the heading. */
        public boolean isAgainst(double bearingDeg) {
            double d = Math.abs(((bearingDeg - headingDeg - 180) % 360 + 540) % 360 - 180);
            return d <= toleranceDeg;
        }
    }

    /**
     * A textured box moving along straight segments between keyframes (times ts, centres xs/ys), at constant
     * velocity on each; a segment with equal ends is a stop. Shown from the first to the last keyframe.
     */
    public record Mover(String id, double[] ts, double[] xs, double[] ys, double width, double height) {
        /** Two keyframes: from one point to another. */
        public static Mover straight(String id, double fromX, double fromY, double toX, double toY, double start,
                double end, double width, double height) {
            return new Mover(id, new double[] {start, end}, new double[] {fromX, toX}, new double[] {fromY, toY},
                    width, height);
        }

        public double startSeconds() {
            return ts[0];
        }

        public double endSeconds() {
            return ts[ts.length - 1];
        }

        private int segment(double t) {
            int k = 0;
            while (k < ts.length - 2 && t > ts[k + 1]) {
                k++;
            }
            return k;
        }

        public double[] centreAt(double t) {
            int k = segment(t);
            double a = (t - ts[k]) / (ts[k + 1] - ts[k]);
            return new double[] {xs[k] + a * (xs[k + 1] - xs[k]), ys[k] + a * (ys[k + 1] - ys[k])};
        }

        /** Velocity at t, pixels per second. */
        public double[] velocityAt(double t, int frameWidth, int frameHeight) {
            int k = segment(t);
            double dt = ts[k + 1] - ts[k];
            return new double[] {(xs[k + 1] - xs[k]) * frameWidth / dt, (ys[k + 1] - ys[k]) * frameHeight / dt};
        }

        /** Mean speed from the first to the last keyframe, pixels per second. */
        public double speedPxPerSecond(int frameWidth, int frameHeight) {
            double d = 0;
            for (int k = 0; k + 1 < ts.length; k++) {
                d += Math.hypot((xs[k + 1] - xs[k]) * frameWidth, (ys[k + 1] - ys[k]) * frameHeight);
            }
            return d / (endSeconds() - startSeconds());
        }

        /** First and last sampled time the centre is inside the zone, or null if never. */
        public double[] insideInterval(Zone z, double step) {
            double first = Double.NaN;
            double last = Double.NaN;
            for (double t = startSeconds(); t <= endSeconds() + 1e-9; t += step / 4) {
                double[] c = centreAt(t);
                if (z.contains(c[0], c[1])) {
                    if (Double.isNaN(first)) {
                        first = t;
                    }
                    last = t;
                }
            }
            return Double.isNaN(first) ? null : new double[] {first, last};
        }

        /**
         * The intervals in which the centre is inside the zone and moves against its heading faster than
         * {@code minSpeed} pixels per second: each one is a wrong-way passage.
         */
        public List<double[]> againstIntervals(Zone z, double step, int frameWidth, int frameHeight, double minSpeed) {
            List<double[]> out = new ArrayList<>();
            double first = Double.NaN;
            double last = Double.NaN;
            for (double t = startSeconds(); t <= endSeconds() + 1e-9; t += step / 4) {
                double[] c = centreAt(t);
                double[] v = velocityAt(Math.min(t + 1e-6, endSeconds()), frameWidth, frameHeight);
                boolean against = z.contains(c[0], c[1]) && Math.hypot(v[0], v[1]) > minSpeed
                        && z.isAgainst(wayward.zone.ZoneMeter.bearingDeg(v[0], v[1]));
                if (against) {
                    if (Double.isNaN(first)) {
                        first = t;
                    }
                    last = t;
                } else if (!Double.isNaN(first)) {
                    out.add(new double[] {first, last});
                    first = Double.NaN;
                }
            }
            if (!Double.isNaN(first)) {
                out.add(new double[] {first, last});
            }
            return out;
        }
    }

    /** Reads a scene file; a mistake gives an IllegalArgumentException naming file and key. */
    public static Scene load(Path file) throws IOException {
        TomlParseResult t = Toml.parse(file);
        if (t.hasErrors()) {
            throw new IllegalArgumentException(file + ":" + t.errors().get(0).position().line() + ": "
                    + t.errors().get(0).getMessage());
        }
        String name = file.getFileName().toString().replace(".scene.toml", "");
        List<Line> lines = new ArrayList<>();
        TomlArray la = t.getArray("line");
        for (int i = 0; la != null && i < la.size(); i++) {
            TomlTable l = la.getTable(i);
            lines.add(new Line(num(file, l, "x0"), num(file, l, "y0"), num(file, l, "x1"), num(file, l, "y1"),
                    opt(file, l, "width_px", 3), opt(file, l, "dash_px", 0)));
        }
        List<Zone> zones = new ArrayList<>();
        TomlArray za = t.getArray("zone");
        for (int i = 0; za != null && i < za.size(); i++) {
            TomlTable z = za.getTable(i);
            TomlArray p = z.getArray("polygon");
            if (p == null || p.size() < 3) {
                throw new IllegalArgumentException(file + ": zone[" + i + "].polygon: expected at least 3 points");
            }
            double[] xs = new double[p.size()];
            double[] ys = new double[p.size()];
            for (int k = 0; k < p.size(); k++) {
                xs[k] = number(p.getArray(k).get(0));
                ys[k] = number(p.getArray(k).get(1));
            }
            zones.add(new Zone(z.getString("id"), xs, ys, num(file, z, "heading_deg"),
                    opt(file, z, "tolerance_deg", 60)));
        }
        List<Mover> movers = new ArrayList<>();
        TomlArray ma = t.getArray("mover");
        for (int i = 0; ma != null && i < ma.size(); i++) {
            TomlTable m = ma.getTable(i);
            TomlArray size = m.getArray("size");
            TomlArray path = m.getArray("path");
            if (path != null) {
                // [[t, x, y], ...]: keyframes in time order
                double[] ts = new double[path.size()];
                double[] xs = new double[path.size()];
                double[] ys = new double[path.size()];
                for (int k = 0; k < path.size(); k++) {
                    ts[k] = number(path.getArray(k).get(0));
                    xs[k] = number(path.getArray(k).get(1));
                    ys[k] = number(path.getArray(k).get(2));
                    if (k > 0 && ts[k] <= ts[k - 1]) {
                        throw new IllegalArgumentException(file + ": mover[" + i + "].path[" + k + "]: times must grow");
                    }
                }
                if (path.size() < 2) {
                    throw new IllegalArgumentException(file + ": mover[" + i + "].path: at least 2 keyframes");
                }
                movers.add(new Mover(m.getString("id"), ts, xs, ys, number(size.get(0)), number(size.get(1))));
            } else {
                TomlArray from = m.getArray("from");
                TomlArray to = m.getArray("to");
                movers.add(Mover.straight(m.getString("id"), number(from.get(0)), number(from.get(1)),
                        number(to.get(0)), number(to.get(1)), num(file, m, "start_s"), num(file, m, "end_s"),
                        number(size.get(0)), number(size.get(1))));
            }
        }
        return new Scene(name, (int) num(file, t, "width"), (int) num(file, t, "height"), num(file, t, "fps"),
                num(file, t, "seconds"), (long) num(file, t, "seed"), opt(file, t, "noise", 0),
                (int) opt(file, t, "bitrate_kbps", 800), lines, zones, movers, nuisances(file, t));
    }

    private static Nuisances nuisances(Path file, TomlParseResult t) {
        List<Light> lights = new ArrayList<>();
        TomlArray la = t.getArray("light");
        for (int i = 0; la != null && i < la.size(); i++) {
            TomlTable l = la.getTable(i);
            lights.add(new Light(num(file, l, "at_s"), opt(file, l, "ramp_s", 0), opt(file, l, "gain", 1),
                    opt(file, l, "offset", 0)));
        }
        TomlTable shake = t.getTable("shake");
        TomlTable b = t.getTable("bump");
        Bump bump = b == null ? null : new Bump(num(file, b, "at_s"), opt(file, b, "dx_px", 0), opt(file, b, "dy_px", 0));
        TomlTable r = t.getTable("rain");
        Rain rain = r == null ? null : new Rain((int) num(file, r, "streaks"), opt(file, r, "length_px", 12),
                opt(file, r, "angle_deg", 170), opt(file, r, "brightness", 60));
        List<Sway> sways = new ArrayList<>();
        TomlArray sa = t.getArray("sway");
        for (int i = 0; sa != null && i < sa.size(); i++) {
            TomlTable w = sa.getTable(i);
            sways.add(new Sway(num(file, w, "x"), num(file, w, "y"), num(file, w, "width"), num(file, w, "height"),
                    num(file, w, "amplitude_px"), num(file, w, "period_s"), opt(file, w, "angle_deg", 90)));
        }
        TomlTable sh = t.getTable("shadow");
        Shadow shadow = sh == null ? null : new Shadow(num(file, sh, "start_s"), num(file, sh, "end_s"),
                num(file, sh, "from_x"), num(file, sh, "to_x"), opt(file, sh, "width", 0.3),
                opt(file, sh, "darkness", 0.4));
        TomlTable tt = t.getTable("tamper");
        Tamper tamper = null;
        if (tt != null) {
            tamper = new Tamper(tt.getString("kind"), num(file, tt, "at_s"));
            tamper.expectedEvent(); // checks the kind
        }
        return new Nuisances(lights, shake == null ? 0 : num(file, shake, "amplitude_px"),
                shake == null ? 0 : opt(file, shake, "hz", 3), bump, rain, sways, shadow, tamper);
    }

    private static double num(Path file, TomlTable t, String key) {
        Object v = t.get(key);
        if (!(v instanceof Number)) {
            throw new IllegalArgumentException(file + ": " + key + ": " + v + " (expected a number)");
        }
        return ((Number) v).doubleValue();
    }

    private static double opt(Path file, TomlTable t, String key, double fallback) {
        return t.contains(key) ? num(file, t, key) : fallback;
    }

    private static double number(Object v) {
        return ((Number) v).doubleValue();
    }
}

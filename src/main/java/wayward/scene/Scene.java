package wayward.scene;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

/**
 * A scenario for {@link SceneGenerator}, read from a scene TOML file (see test-streams/*.scene.toml). All
 * positions are fractions of the frame (x right, y down); times are seconds from the first frame.
 *
 * <p>The file format (every key not marked "required" is optional):
 * <pre>
 * width, height, fps, seconds, seed     required: picture size (px), frame rate, length (s), random seed
 * noise = 2.0                           Gaussian sensor noise, σ in grey levels (default 0)
 * bitrate_kbps = 450                    H.264 bit rate (default 800)
 * background = "aero1.jpg"              a real photograph as the ground, scaled to cover the frame (centre crop);
 *                                       a file name under /usr/share/doc/opencv-doc/examples/data/ (Debian's
 *                                       opencv-doc package); default: generated asphalt-like value noise
 * [[line]]     x0 y0 x1 y1, width_px = 3, dash_px = 0       a painted line on the ground
 * [[zone]]     id, polygon = [[x, y], ...], heading_deg, tolerance_deg = 60
 * [[mover]]    id, size = [w, h] (required), and either from = [x, y], to = [x, y], start_s, end_s
 *              or path = [[t, x, y], ...] (keyframes, constant velocity in between)
 *   sizes = [[w, h], ...]     one size per keyframe (2 for from/to), linear in between: perspective, a mover
 *                             shrinking towards the horizon; the texture is made at the largest size
 *   texture = "noise"         "noise" (default: blocks of varied grey with fine detail and a dark frame),
 *                             "plain" (one flat grey: grey = 160, rim_px = 0 a darker rim 1 or 2 px wide,
 *                             rim_grey = 0.45 · grey), or "photo" (photo = "FILE" implies it: a patch of a real
 *                             photograph under the opencv-doc folder above, centred at photo_at = [0.5, 0.5] of
 *                             the photo, photo_scale = 1.0 photo px per scene px)
 * [[light]]    at_s, ramp_s = 0, gain = 1, offset = 0       brightness steps and ramps: v · gain + offset
 * [flicker]    kind = "mains" | "random", amplitude (relative, e.g. 0.15), hz; centre = [x, y] and radius
 *              (fraction of the width, Gaussian fall-off) for a lamp's pool of light, else the whole picture.
 *              "mains": gain 1 + a·sin(2π·hz·t), sampled by the frame rate (100 Hz lamps on 50 Hz mains beat
 *              with the camera's 15 fps at 5 Hz); "random": a new level in [−a, a] every 1/hz s, linear between
 * [[glare]]    headlight glare, a bright soft blob added after the light and clipped at 255: brightness (grey
 *              levels at the centre), radius (σ, fraction of the width); either mover = "ID" with offset =
 *              [dx, dy] (shown while that mover is), or from, to, start_s, end_s (a sweeping beam)
 * [shake]      amplitude_px, hz = 3              [bump] at_s, dx_px, dy_px
 * [rain]       streaks, length_px = 12, angle_deg = 170, brightness = 60
 * [[sway]]     x, y, width, height, amplitude_px, period_s, angle_deg = 90
 * [shadow]     start_s, end_s, from_x, to_x, width = 0.3, darkness = 0.4
 * [tamper]     kind = "cover" | "freeze" | "blur", at_s
 * </pre>
 * A scene without the newer keys (texture, sizes, background, flicker, glare) renders as it did before they
 * existed.
 */
public record Scene(String name, int width, int height, double fps, double seconds, long seed, double noise,
        int bitrateKbps, String background, List<Line> lines, List<Zone> zones, List<Mover> movers,
        Nuisances nuisances) {

    /** Where the real photographs come from: Debian's opencv-doc package (or the wayward.photos property). */
    public static Path photoFolder() {
        return Path.of(System.getProperty("wayward.photos", "/usr/share/doc/opencv-doc/examples/data"));
    }

    /** What a real camera adds besides traffic; all optional, none by default. */
    public record Nuisances(List<Light> lights, double shakePx, double shakeHz, Bump bump, Rain rain,
            List<Sway> sways, Shadow shadow, Tamper tamper, Flicker flicker, List<Glare> glares) {
        public static final Nuisances NONE = new Nuisances(List.of(), 0, 0, null, null, List.of(), null, null, null,
                List.of());
    }

    /**
     * Flickering light: "mains" (gain 1 + amplitude·sin(2π·hz·t)) or "random" (a new level in ±amplitude every
     * 1/hz s, linear between). Over the whole picture when radius is NaN, else a pool of light around
     * (centreX, centreY) with a Gaussian fall-off of σ = radius (fraction of the width).
     */
    public record Flicker(String kind, double amplitude, double hz, double centreX, double centreY, double radius) {
    }

    /**
     * Headlight glare: a bright soft blob (Gaussian, σ = radius as a fraction of the width, brightness in grey
     * levels at its centre). It rides on the mover {@code moverId} at offset (dx, dy), or, with moverId null,
     * sweeps from (fromX, fromY) to (toX, toY) between startSeconds and endSeconds.
     */
    public record Glare(String moverId, double dx, double dy, double fromX, double fromY, double toX, double toY,
            double startSeconds, double endSeconds, double radius, double brightness) {
    }

    /**
     * What a mover looks like: "noise" (the generator's blocks and grain), "plain" (flat {@code grey} with an
     * optional rim of {@code rimPx} px in {@code rimGrey}) or "photo" (a patch of {@code photo}, centred at
     * (photoX, photoY) of the photograph, photoScale photograph px per scene px).
     */
    public record Look(String texture, double grey, int rimPx, double rimGrey, String photo, double photoX,
            double photoY, double photoScale) {
        public static final Look NOISE = new Look("noise", 0, 0, 0, null, 0.5, 0.5, 1);
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
     * velocity on each; a segment with equal ends is a stop. Shown from the first to the last keyframe. With
     * per-keyframe sizes (ws/hs, else null) its size changes linearly between keyframes; width and height are
     * then the largest ones (the texture's size).
     */
    public record Mover(String id, double[] ts, double[] xs, double[] ys, double width, double height, double[] ws,
            double[] hs, Look look) {
        /** A noise-textured mover of constant size. */
        public Mover(String id, double[] ts, double[] xs, double[] ys, double width, double height) {
            this(id, ts, xs, ys, width, height, null, null, Look.NOISE);
        }

        /** Width and height (fractions of the frame) at t. */
        public double[] sizeAt(double t) {
            if (ws == null) {
                return new double[] {width, height};
            }
            int k = segment(t);
            double a = Math.max(0, Math.min(1, (t - ts[k]) / (ts[k + 1] - ts[k])));
            return new double[] {ws[k] + a * (ws[k + 1] - ws[k]), hs[k] + a * (hs[k + 1] - hs[k])};
        }

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
        return SceneReader.read(file);
    }
}

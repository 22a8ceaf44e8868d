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
        int bitrateKbps, List<Line> lines, List<Zone> zones, List<Mover> movers) {

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

    /** A textured box moving at constant velocity from one point to another. */
    public record Mover(String id, double fromX, double fromY, double toX, double toY, double startSeconds,
            double endSeconds, double width, double height) {
        public double[] centreAt(double t) {
            double a = (t - startSeconds) / (endSeconds - startSeconds);
            return new double[] {fromX + a * (toX - fromX), fromY + a * (toY - fromY)};
        }

        public double speedPxPerSecond(int frameWidth, int frameHeight) {
            return Math.hypot((toX - fromX) * frameWidth, (toY - fromY) * frameHeight) / (endSeconds - startSeconds);
        }

        /** First and last sampled time the centre is inside the zone, or null if never. */
        public double[] insideInterval(Zone z, double step) {
            double first = Double.NaN;
            double last = Double.NaN;
            for (double t = startSeconds; t <= endSeconds + 1e-9; t += step / 4) {
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
            TomlArray from = m.getArray("from");
            TomlArray to = m.getArray("to");
            TomlArray size = m.getArray("size");
            movers.add(new Mover(m.getString("id"), number(from.get(0)), number(from.get(1)), number(to.get(0)),
                    number(to.get(1)), num(file, m, "start_s"), num(file, m, "end_s"), number(size.get(0)),
                    number(size.get(1))));
        }
        return new Scene(name, (int) num(file, t, "width"), (int) num(file, t, "height"), num(file, t, "fps"),
                num(file, t, "seconds"), (long) num(file, t, "seed"), opt(file, t, "noise", 0),
                (int) opt(file, t, "bitrate_kbps", 800), lines, zones, movers);
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

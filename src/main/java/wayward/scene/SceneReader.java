package wayward.scene;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.tomlj.Toml;
import org.tomlj.TomlArray;
import org.tomlj.TomlParseResult;
import org.tomlj.TomlTable;
import wayward.scene.Scene.Bump;
import wayward.scene.Scene.Flicker;
import wayward.scene.Scene.Glare;
import wayward.scene.Scene.Light;
import wayward.scene.Scene.Line;
import wayward.scene.Scene.Look;
import wayward.scene.Scene.Mover;
import wayward.scene.Scene.Nuisances;
import wayward.scene.Scene.Rain;
import wayward.scene.Scene.Shadow;
import wayward.scene.Scene.Sway;
import wayward.scene.Scene.Tamper;
import wayward.scene.Scene.Zone;

/** A scene TOML file read into a {@link Scene}, with messages that name the file and the key at fault. */
final class SceneReader {
    private SceneReader() {
    }

    static Scene read(Path file) throws IOException {
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
            movers.add(mover(file, i, ma.getTable(i)));
        }
        for (int i = 0; i < movers.size(); i++) {
            for (int j = 0; j < i; j++) {
                if (movers.get(i).id().equals(movers.get(j).id())) {
                    throw new IllegalArgumentException(file + ": mover[" + i + "].id: " + movers.get(i).id()
                            + " (expected an id no other mover has)");
                }
            }
        }
        return new Scene(name, (int) num(file, t, "width"), (int) num(file, t, "height"), num(file, t, "fps"),
                num(file, t, "seconds"), (long) num(file, t, "seed"), opt(file, t, "noise", 0),
                (int) opt(file, t, "bitrate_kbps", 800), t.getString("background"), lines, zones, movers,
                nuisances(file, t, movers));
    }

    private static Mover mover(Path file, int i, TomlTable m) {
        String where = "mover[" + i + "]";
        TomlArray size = m.getArray("size");
        if (size == null || size.size() != 2) {
            throw new IllegalArgumentException(file + ": " + where + ".size: expected [width, height]");
        }
        TomlArray path = m.getArray("path");
        double[] ts;
        double[] xs;
        double[] ys;
        if (path != null) {
            // [[t, x, y], ...]: keyframes in time order
            if (path.size() < 2) {
                throw new IllegalArgumentException(file + ": " + where + ".path: at least 2 keyframes");
            }
            ts = new double[path.size()];
            xs = new double[path.size()];
            ys = new double[path.size()];
            for (int k = 0; k < path.size(); k++) {
                ts[k] = number(path.getArray(k).get(0));
                xs[k] = number(path.getArray(k).get(1));
                ys[k] = number(path.getArray(k).get(2));
                if (k > 0 && ts[k] <= ts[k - 1]) {
                    throw new IllegalArgumentException(file + ": " + where + ".path[" + k + "]: times must grow");
                }
            }
        } else {
            TomlArray from = m.getArray("from");
            TomlArray to = m.getArray("to");
            ts = new double[] {num(file, m, "start_s"), num(file, m, "end_s")};
            xs = new double[] {number(from.get(0)), number(to.get(0))};
            ys = new double[] {number(from.get(1)), number(to.get(1))};
        }
        double width = number(size.get(0));
        double height = number(size.get(1));
        double[] ws = null;
        double[] hs = null;
        TomlArray sizes = m.getArray("sizes");
        if (sizes != null) {
            if (sizes.size() != ts.length) {
                throw new IllegalArgumentException(file + ": " + where + ".sizes: " + sizes.size()
                        + " sizes (expected one per keyframe: " + ts.length + ")");
            }
            ws = new double[ts.length];
            hs = new double[ts.length];
            for (int k = 0; k < ts.length; k++) {
                ws[k] = number(sizes.getArray(k).get(0));
                hs[k] = number(sizes.getArray(k).get(1));
                width = Math.max(width, ws[k]);
                height = Math.max(height, hs[k]);
            }
        }
        String photo = m.getString("photo");
        String texture = m.getString("texture");
        if (texture == null) {
            texture = photo != null ? "photo" : "noise";
        }
        Look look;
        switch (texture) {
            case "noise" -> look = Look.NOISE;
            case "plain" -> {
                double grey = opt(file, m, "grey", 160);
                int rim = (int) opt(file, m, "rim_px", 0);
                if (rim < 0 || rim > 2) {
                    throw new IllegalArgumentException(file + ": " + where + ".rim_px: " + rim + " (expected 0 to 2)");
                }
                look = new Look("plain", grey, rim, opt(file, m, "rim_grey", 0.45 * grey), null, 0.5, 0.5, 1);
            }
            case "photo" -> {
                if (photo == null) {
                    throw new IllegalArgumentException(file + ": " + where + ".photo: required with texture = \"photo\"");
                }
                TomlArray at = m.getArray("photo_at");
                look = new Look("photo", 0, 0, 0, photo, at == null ? 0.5 : number(at.get(0)),
                        at == null ? 0.5 : number(at.get(1)), opt(file, m, "photo_scale", 1));
            }
            default -> throw new IllegalArgumentException(file + ": " + where + ".texture: " + texture
                    + " (expected noise, plain or photo)");
        }
        return new Mover(m.getString("id"), ts, xs, ys, width, height, ws, hs, look);
    }

    private static Nuisances nuisances(Path file, TomlParseResult t, List<Mover> movers) {
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
        TomlTable fl = t.getTable("flicker");
        Flicker flicker = null;
        if (fl != null) {
            String kind = fl.getString("kind");
            if (!"mains".equals(kind) && !"random".equals(kind)) {
                throw new IllegalArgumentException(file + ": flicker.kind: " + kind + " (expected mains or random)");
            }
            TomlArray centre = fl.getArray("centre");
            flicker = new Flicker(kind, num(file, fl, "amplitude"), num(file, fl, "hz"),
                    centre == null ? 0.5 : number(centre.get(0)), centre == null ? 0.5 : number(centre.get(1)),
                    opt(file, fl, "radius", Double.NaN));
        }
        List<Glare> glares = new ArrayList<>();
        TomlArray ga = t.getArray("glare");
        for (int i = 0; ga != null && i < ga.size(); i++) {
            TomlTable g = ga.getTable(i);
            String on = g.getString("mover");
            double radius = num(file, g, "radius");
            double brightness = num(file, g, "brightness");
            if (on != null) {
                if (movers.stream().noneMatch(m -> m.id().equals(on))) {
                    throw new IllegalArgumentException(file + ": glare[" + i + "].mover: " + on + " (expected a mover's id)");
                }
                TomlArray off = g.getArray("offset");
                glares.add(new Glare(on, off == null ? 0 : number(off.get(0)), off == null ? 0 : number(off.get(1)),
                        0, 0, 0, 0, 0, 0, radius, brightness));
            } else {
                TomlArray from = g.getArray("from");
                TomlArray to = g.getArray("to");
                if (from == null || to == null) {
                    throw new IllegalArgumentException(file + ": glare[" + i + "]: expected mover, or from and to");
                }
                glares.add(new Glare(null, 0, 0, number(from.get(0)), number(from.get(1)), number(to.get(0)),
                        number(to.get(1)), num(file, g, "start_s"), num(file, g, "end_s"), radius, brightness));
            }
        }
        return new Nuisances(lights, shake == null ? 0 : num(file, shake, "amplitude_px"),
                shake == null ? 0 : opt(file, shake, "hz", 3), bump, rain, sways, shadow, tamper, flicker, glares);
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

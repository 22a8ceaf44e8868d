package wayward.config;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import org.tomlj.TomlArray;
import org.tomlj.TomlPosition;
import org.tomlj.TomlTable;

/**
 * Reads typed values from one TOML table. A wrong value is reported as {@code key.path: value (expected …)} and
 * the caller gets its fallback. Remembers which keys were read, so {@link #finish} can report the rest as unknown.
 */
final class TableReader {
    /** What an id (camera, zone, instance name) may be, for messages. */
    static final String ID_EXPECTED = "lower-case letters, digits, '.', '_' or '-', 1 to 63 characters";
    private static final String ID_PATTERN = "[a-z0-9][a-z0-9._-]{0,62}";

    private final ConfigErrors errors;
    private final TomlTable table;
    private final String path;
    private final TomlPosition position;
    private final Set<String> known = new LinkedHashSet<>();
    private final Set<String> refused = new HashSet<>();

    /** {@code path} is the key path of the table ("" for the file's top), {@code position} where the table starts. */
    TableReader(ConfigErrors errors, TomlTable table, String path, TomlPosition position) {
        this.errors = errors;
        this.table = table;
        this.path = path;
        this.position = position;
    }

    /** True when {@code s} is a valid id (see {@link #ID_EXPECTED}); false for null. */
    static boolean isId(String s) {
        return s != null && s.matches(ID_PATTERN);
    }

    String key(String name) {
        return path.isEmpty() ? name : path + "." + name;
    }

    boolean has(String name) {
        known.add(name);
        return table.get(List.of(name)) != null;
    }

    TomlPosition where(String name) {
        TomlPosition p = table.inputPositionOf(List.of(name));
        return p != null ? p : position;
    }

    void error(String name, Object value, String expected) {
        errors.at(where(name), key(name) + ": " + TomlText.render(value) + " (expected " + expected + ")");
    }

    /** A wrong item of the array {@code name}: {@code key[i]: value (expected …)} at the item's position. */
    void errorAtItem(String name, TomlArray a, int i, String expected) {
        TomlPosition at = a.inputPositionOf(i);
        errors.at(at != null ? at : where(name), key(name) + "[" + i + "]: " + TomlText.render(a.get(i))
                + " (expected " + expected + ")");
    }

    void errorAtTable(String name, String text) {
        errors.at(position, key(name) + ": " + text);
    }

    Object raw(String name) {
        known.add(name);
        return table.get(List.of(name));
    }

    /** The sub-table {@code [name]}, or null when absent or not a table (reported). */
    TableReader section(String name) {
        Object v = raw(name);
        if (v == null) {
            return null;
        }
        if (v instanceof TomlTable) {
            return new TableReader(errors, (TomlTable) v, key(name), table.inputPositionOf(List.of(name)));
        }
        error(name, v, "a table [" + key(name) + "]");
        return null;
    }

    /** The tables {@code [[name]]} in order; empty when absent or not an array of tables (reported). */
    List<TableReader> entries(String name) {
        Object v = raw(name);
        List<TableReader> out = new ArrayList<>();
        if (v == null) {
            return out;
        }
        if (!(v instanceof TomlArray a) || !allTables(a)) {
            error(name, v, "tables written as [[" + key(name).replaceAll("\\[\\d+\\]", "") + "]]");
            return out;
        }
        for (int i = 0; i < a.size(); i++) {
            out.add(new TableReader(errors, (TomlTable) a.get(i), key(name) + "[" + i + "]", a.inputPositionOf(i)));
        }
        return out;
    }

    private static boolean allTables(TomlArray a) {
        for (int i = 0; i < a.size(); i++) {
            if (!(a.get(i) instanceof TomlTable)) {
                return false;
            }
        }
        return true;
    }

    String requiredString(String name, String expected) {
        Object v = raw(name);
        if (v == null) {
            errorAtTable(name, "missing (expected " + expected + ")");
            return null;
        }
        if (!(v instanceof String) || ((String) v).isBlank()) {
            error(name, v, expected);
            return null;
        }
        return (String) v;
    }

    /** A required id; one that breaks the pattern is reported and still returned, so checks go on. */
    String requiredId(String name) {
        String id = requiredString(name, ID_EXPECTED);
        if (id != null && !isId(id)) {
            error(name, id, ID_EXPECTED);
        }
        return id;
    }

    String string(String name, String fallback, String expected) {
        Object v = raw(name);
        if (v == null) {
            return fallback;
        }
        if (!(v instanceof String) || ((String) v).isBlank()) {
            error(name, v, expected);
            return fallback;
        }
        return (String) v;
    }

    boolean bool(String name, boolean fallback) {
        Object v = raw(name);
        if (v == null) {
            return fallback;
        }
        if (!(v instanceof Boolean)) {
            error(name, v, "true or false");
            return fallback;
        }
        return (Boolean) v;
    }

    int integer(String name, int fallback, int min, int max) {
        Object v = raw(name);
        if (v == null) {
            return fallback;
        }
        if (!(v instanceof Long) || (Long) v < min || (Long) v > max) {
            error(name, v, "a whole number from " + min + " to " + max);
            return fallback;
        }
        return (int) (long) (Long) v;
    }

    double number(String name, double fallback, double min, double max) {
        return number(name, fallback, min, max,
                "a number from " + TomlText.format(min) + " to " + TomlText.format(max));
    }

    double number(String name, double fallback, double min, double max, String expected) {
        Object v = raw(name);
        if (v == null) {
            return fallback;
        }
        double d;
        if (v instanceof Long) {
            d = (Long) v;
        } else if (v instanceof Double) {
            d = (Double) v;
        } else {
            d = Double.NaN;
        }
        if (!(d >= min && d <= max)) {
            error(name, v, expected);
            return fallback;
        }
        return d;
    }

    /** A polygon [[x, y], ...] in frame fractions; returns {xs, ys} or null after reporting. */
    double[][] polygon(String name) {
        Object v = raw(name);
        String expected = "at least 3 points [x, y] with x and y from 0 to 1";
        if (v == null) {
            errorAtTable(name, "missing (expected " + expected + ")");
            return null;
        }
        if (!(v instanceof TomlArray) || ((TomlArray) v).size() < 3) {
            error(name, v, expected);
            return null;
        }
        TomlArray a = (TomlArray) v;
        double[] xs = new double[a.size()];
        double[] ys = new double[a.size()];
        boolean ok = true;
        for (int i = 0; i < a.size(); i++) {
            Object p = a.get(i);
            double[] xy = point(p);
            if (xy == null) {
                TomlPosition at = a.inputPositionOf(i);
                errors.at(at != null ? at : where(name), key(name) + "[" + i + "]: " + TomlText.render(p)
                        + " (expected a point [x, y] with x and y from 0 to 1)");
                ok = false;
            } else {
                xs[i] = xy[0];
                ys[i] = xy[1];
            }
        }
        if (ok && Math.abs(area(xs, ys)) < 1e-6) {
            error(name, v, "a polygon that encloses an area");
            ok = false;
        }
        int[] crossing = ok ? Polygons.crossingEdges(xs, ys) : null;
        if (crossing != null) {
            error(name, v, "a polygon whose edges do not cross (edges " + crossing[0] + " and " + crossing[1]
                    + " do; list the points in order around the zone)");
            ok = false;
        }
        return ok ? new double[][] {xs, ys} : null;
    }

    private static double[] point(Object p) {
        if (!(p instanceof TomlArray) || ((TomlArray) p).size() != 2) {
            return null;
        }
        TomlArray a = (TomlArray) p;
        double[] xy = new double[2];
        for (int k = 0; k < 2; k++) {
            Object c = a.get(k);
            double d = c instanceof Long ? (Long) c : (c instanceof Double ? (Double) c : Double.NaN);
            if (!(d >= 0 && d <= 1)) {
                return null;
            }
            xy[k] = d;
        }
        return xy;
    }

    private static double area(double[] xs, double[] ys) {
        double s = 0;
        for (int i = 0, j = xs.length - 1; i < xs.length; j = i++) {
            s += (xs[j] + xs[i]) * (ys[j] - ys[i]);
        }
        return s / 2;
    }

    /** A key that exists but does not apply here: one error naming why, and not listed among the known. */
    void refuse(String name, String expected) {
        Object v = table.get(List.of(name));
        if (v != null) {
            error(name, v, expected);
            refused.add(name);
        }
    }

    /** Reports every key of the table that was neither read nor refused. */
    void finish() {
        for (String k : table.keySet()) {
            if (!known.contains(k) && !refused.contains(k)) {
                TomlPosition p = table.inputPositionOf(List.of(k));
                errors.at(p != null ? p : position, key(k) + ": " + TomlText.render(table.get(List.of(k)))
                        + " (unknown key; expected one of " + String.join(", ", known) + ")");
            }
        }
    }
}

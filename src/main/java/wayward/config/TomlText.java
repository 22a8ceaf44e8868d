package wayward.config;

import java.util.List;
import org.tomlj.TomlArray;
import org.tomlj.TomlTable;

/** Values written as they would be in TOML, for error messages and the printed configuration. Stateless. */
final class TomlText {
    private TomlText() {
    }

    /** A number without a trailing ".0" when it is whole. */
    static String format(double d) {
        if (d == Math.rint(d) && Math.abs(d) < 1e15) {
            return Long.toString((long) d);
        }
        return Double.toString(d);
    }

    /** A value as it would be written in TOML. */
    static String render(Object value) {
        if (value instanceof String) {
            return "\"" + ((String) value).replace("\\", "\\\\").replace("\"", "\\\"") + "\"";
        }
        if (value instanceof Double) {
            return format((Double) value);
        }
        if (value instanceof TomlArray) {
            TomlArray a = (TomlArray) value;
            StringBuilder b = new StringBuilder("[");
            for (int i = 0; i < a.size(); i++) {
                b.append(i == 0 ? "" : ", ").append(render(a.get(i)));
            }
            return b.append(']').toString();
        }
        if (value instanceof TomlTable) {
            TomlTable t = (TomlTable) value;
            StringBuilder b = new StringBuilder("{");
            boolean first = true;
            for (String k : t.keySet()) {
                b.append(first ? " " : ", ").append(k).append(" = ").append(render(t.get(List.of(k))));
                first = false;
            }
            return b.append(first ? "}" : " }").toString();
        }
        return String.valueOf(value);
    }
}

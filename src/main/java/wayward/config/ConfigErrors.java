package wayward.config;

import java.util.ArrayList;
import java.util.List;
import org.tomlj.TomlPosition;

/**
 * The mistakes found in one config file, each a line {@code file:line:column: text}. They come out in file order
 * (line, then column, then the order found), however the binders met them. One per load; not thread-safe.
 */
final class ConfigErrors {
    private final String file;
    private final List<String> lines = new ArrayList<>();
    private final List<long[]> order = new ArrayList<>();
    /** Spaces put into the text before parsing ({line, column}; {@link TomlShape#padDatesBeforeBrackets}). */
    private List<int[]> spaces = List.of();

    ConfigErrors(String file) {
        this.file = file;
    }

    /** The text parsed had these spaces put in ({line, column}): positions after them are told as in the file. */
    void spacesAdded(List<int[]> added) {
        this.spaces = List.copyOf(added);
    }

    void at(TomlPosition p, String text) {
        int line = p == null ? 1 : p.line();
        int column = p == null ? 1 : p.column();
        int shift = 0;
        for (int[] s : spaces) {
            if (s[0] == line && s[1] < column) {
                shift++;
            }
        }
        column -= shift;
        order.add(new long[] {line, column, order.size()});
        lines.add(file + ":" + line + ":" + column + ": " + text);
    }

    /** A mistake no key's position names (a missing table, the environment): reported at 1:1. */
    void atTop(String text) {
        at(TomlPosition.positionAt(1, 1), text);
    }

    boolean isEmpty() {
        return lines.isEmpty();
    }

    /** The lines in file order (line, then column, then the order found). */
    List<String> sorted() {
        List<long[]> o = new ArrayList<>(order);
        o.sort((a, b) -> a[0] != b[0] ? Long.compare(a[0], b[0])
                : a[1] != b[1] ? Long.compare(a[1], b[1]) : Long.compare(a[2], b[2]));
        List<String> out = new ArrayList<>();
        for (long[] k : o) {
            out.add(lines.get((int) k[2]));
        }
        return out;
    }
}

package wayward.config;

import java.util.List;

/** A config file that cannot be used; carries every located error, one line each. */
public final class ConfigException extends Exception {
    /** Lines shown at most; a file of thousands of mistakes is not read line by line by anyone. */
    public static final int MAX_SHOWN = 40;
    private static final long serialVersionUID = 1L;
    private final List<String> errors;

    public ConfigException(List<String> errors) {
        super(String.join("\n", errors));
        this.errors = List.copyOf(errors);
    }

    /** Lines of the form {@code file:line:column: key.path: value (expected …)}. */
    public List<String> errors() {
        return errors;
    }

    /** The first {@link #MAX_SHOWN} lines and, when there are more, one line saying how many. */
    public List<String> shown() {
        if (errors.size() <= MAX_SHOWN) {
            return errors;
        }
        List<String> out = new java.util.ArrayList<>(errors.subList(0, MAX_SHOWN));
        out.add("… and " + (errors.size() - MAX_SHOWN) + " more mistakes not shown");
        return out;
    }
}

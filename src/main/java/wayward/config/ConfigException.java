package wayward.config;

import java.util.List;

/** A config file that cannot be used; carries every located error, one line each. */
public final class ConfigException extends Exception {
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
}

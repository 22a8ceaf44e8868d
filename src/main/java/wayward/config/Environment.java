package wayward.config;

/**
 * What the process environment says over the config file, read once, apart from the file's binding: this
 * instance's name and every instance's ({@code WAYWARD_INSTANCE}, {@code WAYWARD_INSTANCES}, set per unit by the
 * systemd template) and the status server's address ({@code WAYWARD_HTTP}, "host:port" or "off"). Null or blank:
 * not set.
 */
public record Environment(String instance, String instances, String http) {
    /** Nothing set: the file alone decides. */
    public static final Environment NONE = new Environment(null, null, null);

    /** The process's environment. */
    public static Environment fromSystem() {
        return new Environment(System.getenv("WAYWARD_INSTANCE"), System.getenv("WAYWARD_INSTANCES"),
                System.getenv("WAYWARD_HTTP"));
    }

    static boolean set(String v) {
        return v != null && !v.isBlank();
    }
}

package wayward.config;

/**
 * What the process environment says over the config file, read once, apart from the file's binding: this
 * instance's name and every instance's ({@code WAYWARD_INSTANCE}, {@code WAYWARD_INSTANCES}, set per unit by the
 * systemd template), the status server's address ({@code WAYWARD_HTTP}, "host:port" or "off"), and this host's
 * name (the default MQTT client id is made from it). Null or blank: not set.
 */
public record Environment(String instance, String instances, String http, String hostName) {
    /** Nothing set: the file alone decides. */
    public static final Environment NONE = new Environment(null, null, null);

    /** The variables, with a host name that names no host ("host"). */
    public Environment(String instance, String instances, String http) {
        this(instance, instances, http, "host");
    }

    /** The process's environment; the host's name is looked up here, once, not while binding the file. */
    public static Environment fromSystem() {
        String host;
        try {
            host = java.net.InetAddress.getLocalHost().getHostName();
        } catch (java.io.IOException e) {
            host = "host";
        }
        return new Environment(System.getenv("WAYWARD_INSTANCE"), System.getenv("WAYWARD_INSTANCES"),
                System.getenv("WAYWARD_HTTP"), host);
    }

    static boolean set(String v) {
        return v != null && !v.isBlank();
    }
}

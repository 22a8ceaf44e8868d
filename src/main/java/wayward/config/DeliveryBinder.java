package wayward.config;

import java.net.URI;
import java.net.URISyntaxException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import org.tomlj.TomlTable;
import wayward.delivery.MqttConfig;
import wayward.delivery.WebhookConfig;

/**
 * Binds where events go: the [[webhook]] tables, the [mqtt] broker and the [outbox] bound, with their secrets and
 * CA files. Stateless.
 */
final class DeliveryBinder {
    /** Headers wayward sets itself (lower case); a webhook may not replace them. */
    private static final Set<String> OWN_HEADERS = Set.of("host", "content-type", "content-length", "connection",
            "user-agent", "transfer-encoding");
    /** The longest client id every MQTT 3.1.1 broker accepts. */
    private static final int MAX_CLIENT_ID = 23;

    private DeliveryBinder() {
    }

    static List<WebhookConfig> webhooks(TableReader top, Path base) {
        List<WebhookConfig> webhooks = new ArrayList<>();
        java.util.Set<String> urls = new java.util.HashSet<>();
        for (TableReader s : top.entries("webhook")) {
            String url = s.requiredString("url", "an http:// or https:// URL");
            if (url != null && !isHttpUrl(url)) {
                s.error("url", url, "an http:// or https:// URL with a host");
            } else if (url != null && !urls.add(url)) {
                s.error("url", wayward.secret.Urls.mask(url), "a URL no other [[webhook]] has (two would share one"
                        + " delivery progress and send every event phase twice)");
            }
            double timeout = s.number("timeout_seconds", WebhookConfig.DEFAULT_TIMEOUT_SECONDS, 0.1, 300);
            double maxBackoff = s.number("max_backoff_seconds", WebhookConfig.DEFAULT_MAX_BACKOFF_SECONDS, 1, 3600);
            Map<String, String> headers = headers(s);
            String caFile = ReferencedFiles.caFile(s, base, url != null && url.regionMatches(true, 0, "https:", 0, 6));
            String secretFile = s.string("secret_file", null, "a file holding the signing secret");
            byte[] secret = secretFile == null ? null
                    : ReferencedFiles.secret(s, base, "secret_file", secretFile, "signing secret");
            s.finish();
            if (url != null) {
                webhooks.add(new WebhookConfig(url, timeout, maxBackoff, headers, caFile, secretFile, secret));
            }
        }
        return webhooks;
    }

    /** The [mqtt] broker, or null when the table is absent or its url is wrong (reported). */
    static MqttConfig mqtt(TableReader top, Path base, String hostName) {
        TableReader s = top.section("mqtt");
        if (s == null) {
            return null;
        }
        String expected = "mqtt://host[:port] or mqtts://host[:port]";
        String url = s.requiredString("url", expected);
        boolean tls = false;
        if (url != null) {
            URI u = null;
            try {
                u = new URI(url);
            } catch (URISyntaxException e) {
                // reported below
            }
            String scheme = u == null || u.getScheme() == null ? "" : u.getScheme().toLowerCase(Locale.ROOT);
            if (u == null || !(scheme.equals("mqtt") || scheme.equals("mqtts")) || u.getHost() == null
                    || (u.getRawPath() != null && !u.getRawPath().isEmpty()) || u.getRawUserInfo() != null) {
                s.error("url", url, expected + " (user name and password go in username and password_file)");
                url = null;
            } else {
                tls = scheme.equals("mqtts");
            }
        }
        String prefix = s.string("topic_prefix", MqttConfig.DEFAULT_TOPIC_PREFIX,
                "topic levels without wildcards, e.g. \"yard/north\"");
        if (!prefix.matches("[^#+/\\u0000]+(/[^#+/\\u0000]+)*")) {
            s.error("topic_prefix", prefix, "topic levels without '+', '#', empty levels or a leading or trailing '/'");
            prefix = "wayward";
        }
        String clientId = s.string("client_id", defaultClientId(hostName), "1 to 23 letters, digits or '-'");
        if (!clientId.matches("[A-Za-z0-9-]{1,23}")) {
            // MQTT 3.1.1 §3.1.3.1: every broker must accept 1 to 23 of these characters
            s.error("client_id", clientId, "1 to 23 letters, digits or '-' (what every MQTT 3.1.1 broker accepts)");
        }
        String username = s.string("username", null, "a user name");
        String passwordFile = s.string("password_file", null, "a file holding the password");
        byte[] password = null;
        if (passwordFile != null) {
            if (username == null) {
                s.error("password_file", passwordFile, "to come with username");
            }
            password = ReferencedFiles.secret(s, base, "password_file", passwordFile, "password");
        }
        int keepAlive = s.integer("keep_alive_seconds", MqttConfig.DEFAULT_KEEP_ALIVE_SECONDS, 5, 3600);
        String caFile = ReferencedFiles.caFile(s, base, tls);
        int inFlight = s.integer("in_flight", MqttConfig.DEFAULT_IN_FLIGHT, 1, 1000);
        double maxBackoff = s.number("max_backoff_seconds", MqttConfig.DEFAULT_MAX_BACKOFF_SECONDS, 1, 3600);
        boolean commands = s.bool("commands", false);
        s.finish();
        return url == null ? null : new MqttConfig(url, prefix, clientId, username, passwordFile, password, keepAlive,
                caFile, inFlight, maxBackoff, null, commands);
    }

    /** {@code [outbox] max_mb} in bytes. */
    static long outboxMaxBytes(TableReader top) {
        double mb = SiteConfig.DEFAULT_OUTBOX_MB;
        TableReader s = top.section("outbox");
        if (s != null) {
            mb = s.number("max_mb", SiteConfig.DEFAULT_OUTBOX_MB, 1, 1_000_000);
            s.finish();
        }
        return (long) (mb * (1 << 20));
    }

    /** One broker session per instance: the client id carries the instance's name, within 23 characters. */
    static MqttConfig forInstance(MqttConfig mqtt, ShardConfig shard) {
        String suffix = "-" + shard.instance();
        String own = mqtt.clientId();
        String stem = own.substring(0, Math.max(1, Math.min(own.length(), MAX_CLIENT_ID - suffix.length())));
        String id = (stem + suffix).substring(0, Math.min(MAX_CLIENT_ID, stem.length() + suffix.length()));
        return new MqttConfig(mqtt.url(), mqtt.topicPrefix(), id, mqtt.username(), mqtt.passwordFile(),
                mqtt.password(), mqtt.keepAliveSeconds(), mqtt.caFile(), mqtt.inFlight(), mqtt.maxBackoffSeconds(),
                shard.instance(), mqtt.commands());
    }

    /** "wayward-" and this host's name, cut to what every broker accepts. */
    private static String defaultClientId(String host) {
        String id = "wayward-" + host.replaceAll("[^A-Za-z0-9-]", "-");
        return id.substring(0, Math.min(MAX_CLIENT_ID, id.length()));
    }

    /** The {@code headers} inline table: names and values as strings; our own headers may not be replaced. */
    private static Map<String, String> headers(TableReader s) {
        Map<String, String> out = new LinkedHashMap<>();
        Object v = s.raw("headers");
        if (v == null) {
            return out;
        }
        if (!(v instanceof TomlTable)) {
            s.error("headers", v,
                    "a table of header names and string values, e.g. { \"Authorization\" = \"Bearer …\" }");
            return out;
        }
        TomlTable t = (TomlTable) v;
        for (String name : t.keySet()) {
            Object value = t.get(List.of(name));
            String lower = name.toLowerCase(Locale.ROOT);
            if (!name.matches("[!#$%&'*+.^_`|~0-9A-Za-z-]+")) {
                s.error("headers", name, "header names made of letters, digits and - (RFC 9110 token)");
            } else if (OWN_HEADERS.contains(lower) || lower.startsWith("x-wayward-")) {
                s.error("headers", name, "a header wayward does not set itself");
            } else if (!(value instanceof String) || !fieldValue((String) value)) {
                // the value itself is not shown: header values tend to be secrets
                s.error("headers", name, "a string value on one line, without control characters (RFC 9110"
                        + " field value), for header " + name);
            } else {
                out.put(name, (String) value);
            }
        }
        return out;
    }

    /** RFC 9110 §5.5: visible characters, spaces and tabs; no CR, LF or other control characters. */
    private static boolean fieldValue(String v) {
        return v.chars().noneMatch(c -> (c < 0x20 && c != '\t') || c == 0x7f);
    }

    private static boolean isHttpUrl(String url) {
        try {
            URI u = new URI(url);
            String scheme = u.getScheme() == null ? "" : u.getScheme().toLowerCase(Locale.ROOT);
            return (scheme.equals("http") || scheme.equals("https")) && u.getHost() != null;
        } catch (URISyntaxException e) {
            return false;
        }
    }
}

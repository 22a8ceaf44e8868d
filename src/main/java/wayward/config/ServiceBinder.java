package wayward.config;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.ZoneId;
import java.util.ArrayList;
import java.util.List;
import org.tomlj.TomlArray;
import wayward.http.HttpConfig;

/**
 * Binds [service] with the environment's overrides: the data folder, the status server's address and token, and
 * this instance's name among several (each instance then gets a data folder of its own). Stateless.
 */
final class ServiceBinder {
    private ServiceBinder() {
    }

    /**
     * What [service] settles: {@code http} is null when off, {@code shard} null when one instance watches all,
     * {@code timeZone} null when not set.
     */
    record Service(Path dataDir, HttpConfig http, ShardConfig shard, ZoneId timeZone, java.time.Duration maxMute) {
    }

    /** What {@code time_zone} must be, for messages. */
    static final String TIME_ZONE_EXPECTED = "a time zone of the tz database such as \"Europe/Berlin\" (a region, "
            + "so that daylight saving follows it; \"UTC\" for none)";

    static Service bind(TableReader top, ConfigErrors errors, Path base, Environment env) {
        Path dataDir = base.resolve(SiteConfig.DEFAULT_DATA_DIR);
        HttpConfig http = new HttpConfig(HttpConfig.DEFAULT_HOST, HttpConfig.DEFAULT_PORT, null, null,
                HttpConfig.DEFAULT_MAX_CONNECTIONS);
        String instance = env.instance();
        List<String> instances = new ArrayList<>();
        // membership through the broker needs one: without [mqtt] the fixed list is all there is
        boolean viaBroker = top.raw("mqtt") != null;
        double muteHours = SiteConfig.DEFAULT_MAX_MUTE_HOURS;
        ZoneId timeZone = null;
        TableReader s = top.section("service");
        if (s != null) {
            String dir = s.string("data_dir", SiteConfig.DEFAULT_DATA_DIR, "a folder path");
            dataDir = base.resolve(dir).normalize();
            if (Files.exists(dataDir) && !Files.isDirectory(dataDir)) {
                s.error("data_dir", dir, "a folder (this path names a file)");
            }
            http = http(s, base);
            String configured = s.string("instance", null, TableReader.ID_EXPECTED);
            if (instance == null || instance.isBlank()) {
                instance = configured;
            }
            instances = instances(s);
            viaBroker = membership(s, viaBroker);
            muteHours = s.number("max_mute_hours", SiteConfig.DEFAULT_MAX_MUTE_HOURS, SiteConfig.MIN_MAX_MUTE_HOURS,
                    SiteConfig.MAX_MAX_MUTE_HOURS);
            timeZone = timeZone(s);
            s.finish();
        }
        String fromEnv = env.instances();
        if (Environment.set(fromEnv)) {
            instances = new ArrayList<>();
            for (String part : fromEnv.split(",")) {
                instances.add(part.trim());
            }
        }
        ShardConfig shard = shard(errors, instance, instances, viaBroker);
        if (shard != null) {
            // instances on one host must not share an outbox or learned headings: a folder each
            dataDir = dataDir.resolve(shard.instance());
        }
        return new Service(dataDir, httpFromEnv(errors, env.http(), http), shard, timeZone,
                java.time.Duration.ofSeconds(Math.round(muteHours * 3600)));
    }

    /**
     * {@code time_zone} of [service]: a region id of the JDK's tz database; null when absent or wrong (reported).
     * Fixed offsets such as "+01:00" are refused: they never change for daylight saving, which a site's clock does.
     */
    private static ZoneId timeZone(TableReader s) {
        String id = s.string("time_zone", null, TIME_ZONE_EXPECTED);
        if (id == null) {
            return null;
        }
        if (!ZoneId.getAvailableZoneIds().contains(id)) {
            s.error("time_zone", id, TIME_ZONE_EXPECTED);
            return null;
        }
        return ZoneId.of(id);
    }

    /** {@code http} ("host:port" or "off") and {@code token_file} of [service]; null when off. */
    private static HttpConfig http(TableReader s, Path base) {
        String expected = "\"host:port\" such as \"127.0.0.1:7431\", or \"off\"";
        String address = s.string("http", HttpConfig.DEFAULT_ADDRESS, expected);
        String tokenFile = s.string("token_file", null, "a file holding the bearer token for the status server");
        byte[] token = tokenFile == null ? null
                : ReferencedFiles.secret(s, base, "token_file", tokenFile, "bearer token");
        int maxConnections = s.integer("http_max_connections", HttpConfig.DEFAULT_MAX_CONNECTIONS, 1,
                HttpConfig.MAX_MAX_CONNECTIONS);
        if (address.equals("off")) {
            return null;
        }
        int colon = address.lastIndexOf(':');
        String host = colon > 0 ? address.substring(0, colon) : "";
        int port = -1;
        try {
            port = colon > 0 ? Integer.parseInt(address.substring(colon + 1)) : -1;
        } catch (NumberFormatException e) {
            // reported below
        }
        if (host.isEmpty() || port < 0 || port > 65535 || !host.matches("[A-Za-z0-9.:\\[\\]-]+")) {
            s.error("http", address, expected);
            return null;
        }
        HttpConfig c = new HttpConfig(host, port, tokenFile, token, maxConnections);
        if (!c.loopback() && tokenFile == null) {
            s.error("http", address, "a loopback address such as 127.0.0.1:7431, or token_file set as well "
                    + "(anything but /health needs the token when the server is reachable from elsewhere)");
        }
        return c;
    }

    /** {@code instances} of [service]: every instance's name; empty when absent or wrong (reported). */
    private static List<String> instances(TableReader s) {
        List<String> instances = new ArrayList<>();
        Object list = s.raw("instances");
        if (list instanceof TomlArray a) {
            for (int i = 0; i < a.size(); i++) {
                if (a.get(i) instanceof String name && TableReader.isId(name)) {
                    instances.add(name);
                } else {
                    s.error("instances", list, "a list of instance names (" + TableReader.ID_EXPECTED + ")");
                    break;
                }
            }
        } else if (list != null) {
            s.error("instances", list, "a list of instance names such as [\"north\", \"south\"]");
        }
        return instances;
    }

    /** This instance's share when an instance or instances are named; null when none are, or after reporting. */
    /** {@code membership} of [service]: "broker" (the default with [mqtt]) or "fixed"; true for broker. */
    private static boolean membership(TableReader s, boolean hasMqtt) {
        String expected = "\"" + ShardConfig.BROKER + "\" (the instances online by their status on the MQTT broker "
                + "share the cameras) or \"" + ShardConfig.FIXED + "\" (all configured instances share them)";
        String m = s.string("membership", hasMqtt ? ShardConfig.BROKER : ShardConfig.FIXED, expected);
        if (m.equals(ShardConfig.BROKER) && !hasMqtt) {
            s.error("membership", m, "\"" + ShardConfig.FIXED + "\", or an [mqtt] broker: the instances see each "
                    + "other through it");
            return false;
        }
        if (!m.equals(ShardConfig.BROKER) && !m.equals(ShardConfig.FIXED)) {
            s.error("membership", m, expected);
            return hasMqtt;
        }
        return m.equals(ShardConfig.BROKER);
    }

    private static ShardConfig shard(ConfigErrors errors, String instance, List<String> instances,
            boolean viaBroker) {
        if (instances.isEmpty() && instance == null) {
            return null;
        }
        String where = "service.instance";
        if (!TableReader.isId(instance)) {
            errors.atTop(where + ": " + TomlText.render(instance) + " (expected this instance's "
                    + "name, " + TableReader.ID_EXPECTED + ", in [service] instance or WAYWARD_INSTANCE)");
        } else if (instances.isEmpty()) {
            errors.atTop("service.instances: missing (expected every instance's name in [service] instances or "
                    + "WAYWARD_INSTANCES, since instance is " + TomlText.render(instance) + ")");
        } else if (!instances.contains(instance)) {
            errors.atTop(where + ": " + TomlText.render(instance) + " (expected one of "
                    + String.join(", ", instances) + ", the instances)");
        } else {
            return new ShardConfig(instance, instances, viaBroker);
        }
        return null;
    }

    /** WAYWARD_HTTP over the config's address (the systemd template sets it per instance); the token stays. */
    private static HttpConfig httpFromEnv(ConfigErrors errors, String value, HttpConfig http) {
        if (!Environment.set(value) || http == null) {
            return http;
        }
        HttpConfig out = http;
        int colon = value.lastIndexOf(':');
        try {
            out = value.equals("off") ? null : new HttpConfig(value.substring(0, colon),
                    Integer.parseInt(value.substring(colon + 1)), http.tokenFile(), http.token(),
                    http.maxConnections());
        } catch (RuntimeException e) {
            errors.atTop("environment WAYWARD_HTTP: " + TomlText.render(value)
                    + " (expected \"host:port\" or \"off\")");
        }
        if (out != null && !out.loopback() && out.tokenFile() == null) {
            // the same rule as for [service] http, however the address is set
            errors.atTop("environment WAYWARD_HTTP: " + TomlText.render(value)
                    + " (expected a loopback address such as 127.0.0.1:7431, or [service] token_file set as"
                    + " well: anything but /health needs the token when the server is reachable from elsewhere)");
        }
        return out;
    }
}

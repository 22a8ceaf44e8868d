package wayward.config;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.tomlj.Toml;
import org.tomlj.TomlArray;
import org.tomlj.TomlParseError;
import org.tomlj.TomlParseResult;
import org.tomlj.TomlPosition;
import wayward.delivery.MqttConfig;
import wayward.delivery.WebhookConfig;

/**
 * Reads a TOML config file (tomlj, TOML 1.0), binds it to {@link SiteConfig} and checks ranges and
 * combinations. Every mistake is collected and reported together, one line each, in the form
 * {@code file:line:column: key.path: value (expected …)}; unknown keys are mistakes too. Relative paths resolve
 * against the config file's folder. Stateless; any thread.
 */
public final class ConfigLoader {
    private ConfigLoader() {
    }

    /** Loads a config file with the process environment's overrides ({@link Environment#fromSystem}). */
    public static SiteConfig load(Path file) throws ConfigException {
        return load(file, Environment.fromSystem());
    }

    /** Loads a config file; {@code env} says what the environment sets over it. */
    public static SiteConfig load(Path file, Environment env) throws ConfigException {
        String shown = file.toString();
        TomlParseResult toml;
        try {
            if (Files.isDirectory(file)) {
                throw new ConfigException(List.of(shown + ": is a folder (expected a TOML config file)"));
            }
            toml = Toml.parse(file);
        } catch (NoSuchFileException e) {
            throw new ConfigException(List.of(shown + ": file not found"));
        } catch (IOException e) {
            throw new ConfigException(List.of(shown + ": cannot read (" + e.getMessage() + ")"));
        }
        ConfigErrors errors = new ConfigErrors(shown);
        if (toml.hasErrors()) {
            for (TomlParseError e : toml.errors()) {
                String message = e.getMessage();
                errors.at(e.position(), "TOML syntax: " + message);
            }
            throw new ConfigException(errors.sorted());
        }
        Path base = file.toAbsolutePath().getParent();
        SiteConfig config = bind(toml, base, file, env, errors);
        if (!errors.isEmpty()) {
            throw new ConfigException(errors.sorted());
        }
        return config;
    }

    private static SiteConfig bind(TomlParseResult root, Path base, Path file, Environment env, ConfigErrors errors) {
        TableReader top = new TableReader(errors, root, "", TomlPosition.positionAt(1, 1));
        Path dataDir = base.resolve(SiteConfig.DEFAULT_DATA_DIR);
        HttpConfig http = new HttpConfig(HttpConfig.DEFAULT_HOST, HttpConfig.DEFAULT_PORT, null, null);
        String instance = env.instance();
        List<String> instances = new ArrayList<>();
        TableReader serviceSection = top.section("service");
        if (serviceSection != null) {
            TableReader s = serviceSection;
            String dir = s.string("data_dir", SiteConfig.DEFAULT_DATA_DIR, "a folder path");
            dataDir = base.resolve(dir).normalize();
            http = http(s, base);
            String configured = s.string("instance", null, TableReader.ID_EXPECTED);
            if (instance == null || instance.isBlank()) {
                instance = configured;
            }
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
            s.finish();
        }
        String fromEnv = env.instances();
        if (Environment.set(fromEnv)) {
            instances = new ArrayList<>();
            for (String part : fromEnv.split(",")) {
                instances.add(part.trim());
            }
        }
        ShardConfig shard = null;
        if (!instances.isEmpty() || instance != null) {
            String where = "service.instance";
            if (!TableReader.isId(instance)) {
                errors.at(TomlPosition.positionAt(1, 1), where + ": " + TomlText.render(instance) + " (expected this instance's "
                        + "name, " + TableReader.ID_EXPECTED + ", in [service] instance or WAYWARD_INSTANCE)");
            } else if (instances.isEmpty()) {
                errors.at(TomlPosition.positionAt(1, 1), "service.instances: missing (expected every instance's name "
                        + "in [service] instances or WAYWARD_INSTANCES, since instance is " + TomlText.render(instance) + ")");
            } else if (!instances.contains(instance)) {
                errors.at(TomlPosition.positionAt(1, 1), where + ": " + TomlText.render(instance) + " (expected one of "
                        + String.join(", ", instances) + ", the instances)");
            } else {
                shard = new ShardConfig(instance, instances);
                // instances on one host must not share an outbox or learned headings: a folder each
                dataDir = dataDir.resolve(instance);
            }
        }
        String httpFromEnv = env.http();
        if (Environment.set(httpFromEnv) && http != null) {
            // per-instance address (the systemd template sets it); the token stays the config's
            int colon = httpFromEnv.lastIndexOf(':');
            try {
                http = httpFromEnv.equals("off") ? null : new HttpConfig(httpFromEnv.substring(0, colon),
                        Integer.parseInt(httpFromEnv.substring(colon + 1)), http.tokenFile(), http.token());
            } catch (RuntimeException e) {
                errors.at(TomlPosition.positionAt(1, 1), "environment WAYWARD_HTTP: " + TomlText.render(httpFromEnv)
                        + " (expected \"host:port\" or \"off\")");
            }
            if (http != null && !http.loopback() && http.tokenFile() == null) {
                // the same rule as for [service] http, however the address is set
                errors.at(TomlPosition.positionAt(1, 1), "environment WAYWARD_HTTP: " + TomlText.render(httpFromEnv)
                        + " (expected a loopback address such as 127.0.0.1:8786, or [service] token_file set as"
                        + " well: anything but /health needs the token when the server is reachable from elsewhere)");
            }
        }
        FlowConfig flow = FlowConfig.DEFAULTS;
        TableReader flowSection = top.section("flow");
        if (flowSection != null) {
            TableReader s = flowSection;
            FlowConfig d = FlowConfig.DEFAULTS;
            int levels = s.integer("levels", d.levels(), 0, 8);
            int iterations = s.integer("iterations", d.iterations(), 1, 20);
            int finestIterations = s.integer("finest_iterations", d.finestIterations(), 1, 20);
            int window = s.integer("window", d.window(), 3, 15);
            if (window % 2 == 0) {
                s.error("window", window, "an odd number from 3 to 15");
                window = d.window();
            }
            double reg = s.number("regularization", d.regularization(), 0, 1000);
            int stride = s.integer("stride", d.stride(), 1, 16);
            int coarseStride = s.integer("coarse_stride", d.coarseStride(), 1, 32);
            int threads = s.integer("threads", d.threads(), 1, 64);
            s.finish();
            flow = new FlowConfig(levels, iterations, finestIterations, window, reg, stride, coarseStride, threads);
        }

        ClipConfig clips = ClipConfig.DEFAULTS;
        TableReader clipsSection = top.section("clips");
        if (clipsSection != null) {
            TableReader s = clipsSection;
            ClipConfig d = ClipConfig.DEFAULTS;
            clips = new ClipConfig(s.bool("enabled", d.enabled()), s.number("pre_roll_seconds", d.preRollSeconds(), 0, 60),
                    s.number("post_roll_seconds", d.postRollSeconds(), 0, 60), s.number("max_seconds", d.maxSeconds(), 5, 3600),
                    s.number("keep_days", d.keepDays(), 0.01, 3650), s.number("keep_gb", d.keepGigabytes(), 0.01, 100000));
            s.finish();
        }

        List<CameraConfig> cameras = CameraBinder.cameras(top, base);

        List<WebhookConfig> webhooks = DeliveryBinder.webhooks(top, base);
        MqttConfig mqtt = DeliveryBinder.mqtt(top, base);
        long outboxMaxBytes = DeliveryBinder.outboxMaxBytes(top);
        top.finish();
        if (shard != null && mqtt != null) {
            mqtt = DeliveryBinder.forInstance(mqtt, shard);
        }
        return new SiteConfig(file, dataDir, flow, cameras, webhooks, clips, mqtt, outboxMaxBytes, http, shard);
    }

    /** {@code http} ("host:port" or "off") and {@code token_file} of [service]; null when off. */
    private static HttpConfig http(TableReader s, Path base) {
        String expected = "\"host:port\" such as \"127.0.0.1:8786\", or \"off\"";
        String address = s.string("http", HttpConfig.DEFAULT_ADDRESS, expected);
        String tokenFile = s.string("token_file", null, "a file holding the bearer token for the status server");
        byte[] token = tokenFile == null ? null : ReferencedFiles.secret(s, base, "token_file", tokenFile, "bearer token");
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
        HttpConfig c = new HttpConfig(host, port, tokenFile, token);
        if (!c.loopback() && tokenFile == null) {
            s.error("http", address, "a loopback address such as 127.0.0.1:8786, or token_file set as well "
                    + "(anything but /health needs the token when the server is reachable from elsewhere)");
        }
        return c;
    }
}

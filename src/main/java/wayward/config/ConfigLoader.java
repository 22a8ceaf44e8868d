package wayward.config;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.tomlj.Toml;
import org.tomlj.TomlArray;
import org.tomlj.TomlParseError;
import org.tomlj.TomlParseResult;
import org.tomlj.TomlPosition;
import wayward.capture.SourceInput;
import wayward.capture.Sources;
import wayward.delivery.MqttConfig;
import wayward.delivery.WebhookConfig;
import wayward.rule.MoverRuleSettings;
import wayward.rule.RuleSettings;
import wayward.secret.Urls;

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

        List<CameraConfig> cameras = new ArrayList<>();
        List<TableReader> cameraTables = top.entries("camera");
        if (cameraTables.isEmpty()) {
            if (!top.has("camera")) {
                top.errorAtTable("camera", "missing (expected at least one [[camera]] table)");
            }
        } else {
            Set<String> ids = new HashSet<>();
            for (TableReader s : cameraTables) {
                CameraConfig c = camera(s, base);
                if (c != null) {
                    if (!ids.add(c.id())) {
                        s.error("id", c.id(), "an id no other camera has");
                    }
                    cameras.add(c);
                }
            }
        }

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

    private static CameraConfig camera(TableReader s, Path base) {
        String id = s.requiredId("id");
        String source = s.requiredString("source", "a video file path or a URL such as rtsp://host/stream");
        boolean loop = s.bool("loop", false);
        if (source != null && Sources.isDevice(source)) {
            if (loop) {
                s.error("loop", true, "false for a webcam; only files can loop");
            }
        } else if (source != null && !Urls.isUrl(source)) {
            Path p = base.resolve(source).normalize();
            if (!Files.isRegularFile(p)) {
                s.error("source", source, "a video file that exists (looked for " + p + ") or a URL");
            }
            source = p.toString();
        } else if (source != null && loop) {
            s.error("loop", true, "false for a URL source; only files can loop");
        }
        int width = s.integer("analysis_width", CameraConfig.DEFAULT_ANALYSIS_WIDTH, 32, 1920);
        if (width % 2 != 0) {
            s.error("analysis_width", width, "an even number from 32 to 1920");
        }
        double fps = s.number("analysis_fps", CameraConfig.DEFAULT_ANALYSIS_FPS, 0.5, 60);
        boolean removeCameraMotion = s.bool("remove_camera_motion", true);
        boolean tamperAlerts = s.bool("tamper_alerts", true);
        SourceInput d = SourceInput.DEFAULTS;
        String transport = s.string("rtsp_transport", d.rtspTransport(), "\"tcp\" or \"udp\"");
        if (!transport.equals("tcp") && !transport.equals("udp")) {
            s.error("rtsp_transport", transport, "\"tcp\" or \"udp\"");
            transport = d.rtspTransport();
        }
        String deviceSize = s.string("device_size", null, "a size such as \"1280x720\"");
        if (deviceSize != null && !deviceSize.matches("[1-9][0-9]{1,4}x[1-9][0-9]{1,4}")) {
            s.error("device_size", deviceSize, "a size such as \"1280x720\"");
            deviceSize = null;
        }
        double deviceFps = s.has("device_fps") ? s.number("device_fps", 0, 1, 240) : 0;
        String deviceFormat = s.string("device_format", null, "a Video4Linux2 input format such as \"mjpeg\" or \"yuyv422\"");
        if (deviceFormat != null && !deviceFormat.matches("[a-z0-9_]{2,20}")) {
            s.error("device_format", deviceFormat, "a Video4Linux2 input format such as \"mjpeg\" or \"yuyv422\"");
            deviceFormat = null;
        }
        if (source != null && !Sources.isDevice(source)) {
            for (String k : new String[] {"device_size", "device_fps", "device_format"}) {
                if (s.raw(k) != null) {
                    s.error(k, s.raw(k), "no such key for a source that is not a webcam (/dev/videoN)");
                }
            }
        }
        SourceInput input = new SourceInput(transport, deviceSize, deviceFps, deviceFormat);
        List<ZoneConfig> zones = new ArrayList<>();
        List<TableReader> zoneTables = s.entries("zone");
        if (zoneTables.isEmpty()) {
            s.errorAtTable("zone", "missing (expected at least one [[camera.zone]] table)");
        } else {
            Set<String> ids = new HashSet<>();
            for (TableReader z : zoneTables) {
                ZoneConfig zone = zone(z);
                if (zone != null) {
                    if (!ids.add(zone.id())) {
                        z.error("id", zone.id(), "an id no other zone of this camera has");
                    }
                    zones.add(zone);
                }
            }
        }
        s.finish();
        if (id == null || source == null) {
            return null;
        }
        return new CameraConfig(id, source, loop, width, fps, removeCameraMotion, input, zones, tamperAlerts);
    }

    private static ZoneConfig zone(TableReader z) {
        String id = z.requiredId("id");
        double[][] polygon = z.polygon("polygon");
        double heading = Double.NaN;
        if (z.has("heading_deg")) {
            String expected = "a bearing from 0 up to, not including, 360 degrees clockwise from image-up";
            heading = z.number("heading_deg", Double.NaN, 0, 360, expected);
            if (heading == 360) {
                z.error("heading_deg", z.raw("heading_deg"), expected);
                heading = Double.NaN;
            }
        }
        double tolerance = z.number("tolerance_deg", ZoneConfig.DEFAULT_TOLERANCE_DEG, 0, 90);
        double minSpeed = z.number("min_speed", ZoneConfig.DEFAULT_MIN_SPEED, 0, 10000);
        double minConfidence = z.number("min_confidence", ZoneConfig.DEFAULT_MIN_CONFIDENCE, 0, 100000);
        double learn = z.number("learn_heading_seconds", 0, 0, 86400);
        if (learn > 0 && !Double.isNaN(heading)) {
            z.error("learn_heading_seconds", z.raw("learn_heading_seconds"), "no learning when heading_deg is set "
                    + "(leave out one of them)");
            learn = 0;
        }
        boolean movers = !Double.isNaN(heading) || learn > 0;
        double hold = z.number("hold_seconds", MoverRuleSettings.DEFAULT_HOLD_SECONDS, 0, 600);
        double clear = z.number("clear_seconds", MoverRuleSettings.DEFAULT_CLEAR_SECONDS, 0, 600);
        double rest = z.number("rest_seconds", MoverRuleSettings.DEFAULT_REST_SECONDS, 0, 3600);
        double onset = 0.02;
        double release = 0.008;
        double minTravel = ZoneConfig.DEFAULT_MIN_TRAVEL_PX;
        double quickTravel = ZoneConfig.DEFAULT_QUICK_TRAVEL_PX;
        double minArea = MoverRuleSettings.DEFAULT_MIN_MOVER_AREA_PX;
        if (movers) {
            // a zone with a heading decides on movers: shares of the zone no longer start its events
            for (String k : new String[] {"onset_level", "release_level"}) {
                z.refuse(k, "no such key for a zone with a heading: it decides on movers (min_mover_area_px, "
                        + "min_travel_px, quick_travel_px, hold_seconds), not on shares of the zone");
            }
            minTravel = z.number("min_travel_px", ZoneConfig.DEFAULT_MIN_TRAVEL_PX, 1, 10000);
            quickTravel = z.number("quick_travel_px", ZoneConfig.DEFAULT_QUICK_TRAVEL_PX, 1, 10000);
            if (quickTravel < minTravel) {
                z.error("quick_travel_px", z.raw("quick_travel_px") != null ? z.raw("quick_travel_px") : quickTravel,
                        "at least min_travel_px " + TomlText.format(minTravel));
                quickTravel = minTravel;
            }
            minArea = z.number("min_mover_area_px", MoverRuleSettings.DEFAULT_MIN_MOVER_AREA_PX, 0, 1000000);
        } else {
            onset = z.number("onset_level", onset, 0.0001, 1);
            release = z.number("release_level", Math.min(onset, release), 0, 1);
            if (release > onset) {
                z.error("release_level", release, "at most onset_level " + TomlText.format(onset));
                release = onset;
            }
            for (String k : new String[] {"min_travel_px", "quick_travel_px", "min_mover_area_px"}) {
                z.refuse(k, "no such key for a zone without a heading: it reports any motion by onset_level and "
                        + "release_level (set heading_deg or learn_heading_seconds to decide on movers)");
            }
        }
        z.finish();
        if (id == null || polygon == null) {
            return null;
        }
        return new ZoneConfig(id, polygon[0], polygon[1], heading, tolerance, minSpeed, minConfidence,
                new RuleSettings(Math.max(onset, 0.0001), Math.max(0, Math.min(release, onset)), hold, clear, rest,
                        minTravel, quickTravel), learn,
                new MoverRuleSettings(hold, clear, rest, minTravel, quickTravel, minArea));
    }

}

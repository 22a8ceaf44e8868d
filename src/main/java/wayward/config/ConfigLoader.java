package wayward.config;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.List;
import org.tomlj.Toml;
import org.tomlj.TomlParseError;
import org.tomlj.TomlParseResult;
import org.tomlj.TomlPosition;
import wayward.delivery.MqttConfig;
import wayward.delivery.WebhookConfig;
import wayward.analysis.CameraConfig;
import wayward.clip.ClipConfig;
import wayward.flow.FlowConfig;

/**
 * Reads a TOML config file (tomlj, TOML 1.0), binds it to {@link SiteConfig} and checks ranges and
 * combinations. Every mistake is collected and reported together, one line each, in the form
 * {@code file:line:column: key.path: value (expected …)}; unknown keys are mistakes too. Relative paths resolve
 * against the config file's folder. Each section has its binder (service, flow and clips, cameras, delivery);
 * this class parses the file and ties them together. Stateless; any thread.
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
        TomlShape.Padded padded;
        try {
            if (Files.isDirectory(file)) {
                throw new ConfigException(List.of(shown + ": is a folder (expected a TOML config file)"));
            }
            String text = TomlShape.text(Files.readAllBytes(file), shown);
            TomlShape.checkNesting(text, shown);
            padded = TomlShape.padDatesBeforeBrackets(text);
            toml = Toml.parse(padded.text());
        } catch (NoSuchFileException e) {
            throw new ConfigException(List.of(shown + ": file not found"));
        } catch (java.nio.file.AccessDeniedException e) {
            throw new ConfigException(List.of(shown + ": cannot read: permission denied (the service's user needs"
                    + " read access)"));
        } catch (IOException e) {
            throw new ConfigException(List.of(shown + ": cannot read (" + e.getMessage() + ")"));
        }
        ConfigErrors errors = new ConfigErrors(shown);
        errors.spacesAdded(padded.spaces());
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
        // this order is the order of the top-level keys named in an unknown-key message
        ServiceBinder.Service service = ServiceBinder.bind(top, errors, base, env);
        FlowConfig flow = FlowClipBinder.flow(top);
        ClipConfig clips = FlowClipBinder.clips(top);
        List<CameraConfig> cameras = CameraBinder.cameras(top, base, service.timeZone());
        List<WebhookConfig> webhooks = DeliveryBinder.webhooks(top, base);
        MqttConfig mqtt = DeliveryBinder.mqtt(top, base, env.hostName());
        long outboxMaxBytes = DeliveryBinder.outboxMaxBytes(top);
        top.finish();
        if (service.shard() != null && mqtt != null) {
            mqtt = DeliveryBinder.forInstance(mqtt, service.shard());
        }
        return new SiteConfig(file, service.dataDir(), flow, cameras, webhooks, clips, mqtt, outboxMaxBytes,
                service.http(), service.shard(), service.timeZone(), service.maxMute());
    }
}

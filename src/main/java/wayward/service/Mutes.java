package wayward.service;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonToken;
import java.io.IOException;
import java.io.StringWriter;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.UUID;
import java.util.concurrent.Executors;
import java.util.concurrent.ScheduledExecutorService;
import java.util.concurrent.TimeUnit;
import java.util.function.Consumer;
import java.util.function.Predicate;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.analysis.CameraConfig;
import wayward.analysis.ZoneConfig;
import wayward.analysis.ZoneGate;
import wayward.event.Event;
import wayward.event.EventKind;
import wayward.http.MuteControl;
import wayward.http.MuteState;

/**
 * The operators' mutes: a zone or a whole camera raises no events until the mute's end time, or until it is ended
 * early. A mute always ends by itself ({@code [service] max_mute_hours} bounds it), survives a restart (kept in
 * {@code data_dir/mutes.json}, written whole and atomically on every change), and each start, early end and expiry
 * is an event phase of its own kind ({@code zone_muted}, {@code camera_muted}) through the outbox, with who and why.
 * It is also the {@link ZoneGate} the cameras' rules ask. Any thread; changes are serialised on this object.
 */
public final class Mutes implements MuteControl, ZoneGate, AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(Mutes.class);
    /** The default of {@code [service] max_mute_hours}. */
    public static final double DEFAULT_MAX_HOURS = 12;
    /** The longest reason kept, characters. */
    public static final int MAX_REASON = 200;
    static final String FILE = "mutes.json";
    private static final JsonFactory JSON = new JsonFactory();

    private final Path file;
    private final Duration longest;
    private final Clock clock;
    private final Consumer<Event> events;
    private final ScheduledExecutorService timer;
    private volatile Map<String, List<String>> zones;
    private volatile Predicate<String> raisesFor = c -> true;

    /** One mute in force and the id its phases share. */
    private record Entry(String id, MuteState state) {
    }

    /** Key "camera" or "camera/zone" → the mute; insertion order. Guarded by this. */
    private final Map<String, Entry> active = new LinkedHashMap<>();
    /** Lock-free copy for {@link #raises}, replaced on every change. */
    private volatile Map<String, Instant> ends = Map.of();

    /**
     * Reads the mutes kept in {@code dataDir}: those that ended while the service was down end now (expired), and
     * so do those whose camera or zone left the config.
     *
     * @param events where the phases go (the event bus)
     */
    public Mutes(Path dataDir, List<CameraConfig> cameras, Duration longest, Clock clock, Consumer<Event> events) {
        this.file = dataDir.resolve(FILE);
        this.longest = longest;
        this.clock = clock;
        this.events = events;
        this.zones = zonesOf(cameras);
        this.timer = Executors.newSingleThreadScheduledExecutor(r -> {
            Thread t = new Thread(r, "mutes");
            t.setDaemon(true);
            return t;
        });
        load();
        timer.scheduleWithFixedDelay(this::expire, 1, 1, TimeUnit.SECONDS);
    }

    private static Map<String, List<String>> zonesOf(List<CameraConfig> cameras) {
        Map<String, List<String>> out = new LinkedHashMap<>();
        for (CameraConfig c : cameras) {
            List<String> z = new ArrayList<>();
            for (ZoneConfig zc : c.zones()) {
                z.add(zc.id());
            }
            out.put(c.id(), List.copyOf(z));
        }
        return out;
    }

    /**
     * Instances sharing a config: only the one watching a camera raises its mutes' phases (all keep the mutes, so
     * a camera that moves stays muted).
     */
    public void raiseOnlyFor(Predicate<String> watching) {
        this.raisesFor = watching;
    }

    /** The config changed (a reload): mutes of cameras or zones no longer in it end now. */
    public synchronized void configChanged(List<CameraConfig> cameras) {
        zones = zonesOf(cameras);
        for (Entry e : List.copyOf(active.values())) {
            if (!known(e.state().camera(), e.state().zone())) {
                end(e, null, "its " + (e.state().zone() == null ? "camera" : "zone") + " left the config", null);
            }
        }
        save();
    }

    private boolean known(String camera, String zone) {
        List<String> z = zones.get(camera);
        return z != null && (zone == null || z.contains(zone));
    }

    private static String key(String camera, String zone) {
        return zone == null ? camera : camera + "/" + zone;
    }

    private static String where(String camera, String zone) {
        return zone == null ? "camera " + camera : "camera " + camera + " zone " + zone;
    }

    @Override
    public boolean raises(String camera, String zone, Instant now) {
        Map<String, Instant> e = ends;
        if (e.isEmpty()) {
            return true;
        }
        Instant whole = e.get(camera);
        Instant own = zone == null ? null : e.get(key(camera, zone));
        return !((whole != null && now.isBefore(whole)) || (own != null && now.isBefore(own)));
    }

    @Override
    public synchronized MuteState mute(String camera, String zone, Instant until, String by, String reason)
            throws Refused {
        if (!zones.containsKey(camera)) {
            throw new Refused("no camera " + camera + " in the config (expected one of "
                    + String.join(", ", zones.keySet()) + ")");
        }
        if (zone != null && !zones.get(camera).contains(zone)) {
            throw new Refused("camera " + camera + " has no zone " + zone + " (expected one of "
                    + String.join(", ", zones.get(camera)) + ")");
        }
        Instant now = clock.instant();
        if (until == null || !until.isAfter(now)) {
            throw new Refused("the end " + until + " is not in the future (now " + now + ")");
        }
        if (Duration.between(now, until).compareTo(longest) > 0) {
            throw new Refused("the end " + until + " is more than " + hours(longest) + " h away (max_mute_hours); a "
                    + "mute always ends by itself");
        }
        String why = clean(reason);
        Entry old = active.get(key(camera, zone));
        if (old != null) {
            end(old, by, "replaced by a mute until " + DateTimeFormatter.ISO_INSTANT.format(until), null);
        }
        Entry e = new Entry(UUID.randomUUID().toString(), new MuteState(camera, zone, now, until, by, why));
        active.put(key(camera, zone), e);
        changed();
        LOG.info("{}: muted until {} by {}{}", where(camera, zone), until, by, why.isEmpty() ? "" : " (" + why + ")");
        if (raisesFor.test(camera)) {
            events.accept(Event.control(e.id(), camera, zone, kind(zone), Event.Phase.START, now, Double.NaN, null,
                    new Event.Control(until, by, why)));
        }
        return e.state();
    }

    @Override
    public synchronized MuteState unmute(String camera, String zone, String by, String reason) throws Refused {
        Entry e = active.get(key(camera, zone));
        if (e == null) {
            throw new Refused(where(camera, zone) + " is not muted" + (active.isEmpty() ? ""
                    : " (muted: " + String.join(", ", active.keySet()) + ")"));
        }
        end(e, by, clean(reason), null);
        changed();
        return e.state();
    }

    /** Ends {@code e}: removed, logged and raised. Holding the lock; the caller saves. */
    private void end(Entry e, String by, String reason, String endedBy) {
        active.remove(key(e.state().camera(), e.state().zone()));
        Instant now = clock.instant();
        MuteState s = e.state();
        LOG.info("{}: mute ended ({}){}", where(s.camera(), s.zone()), endedBy != null ? "its end time came"
                : "by " + by, reason.isEmpty() ? "" : ": " + reason);
        if (raisesFor.test(s.camera())) {
            events.accept(Event.control(e.id(), s.camera(), s.zone(), kind(s.zone()), Event.Phase.END, now,
                    Math.max(0, Duration.between(s.since(), now).toMillis() / 1000.0), endedBy,
                    new Event.Control(null, by, reason)));
        }
    }

    private static EventKind kind(String zone) {
        return zone == null ? EventKind.CAMERA_MUTED : EventKind.ZONE_MUTED;
    }

    /** Mutes whose end time has come end (expired). The timer thread, once a second. */
    private synchronized void expire() {
        Instant now = clock.instant();
        boolean any = false;
        for (Entry e : List.copyOf(active.values())) {
            if (!now.isBefore(e.state().until())) {
                end(e, null, "", Event.EXPIRED);
                any = true;
            }
        }
        if (any) {
            changed();
        }
    }

    @Override
    public synchronized List<MuteState> mutes() {
        List<MuteState> out = new ArrayList<>();
        for (String camera : zones.keySet()) {
            for (Entry e : active.values()) {
                if (e.state().camera().equals(camera)) {
                    out.add(e.state());
                }
            }
        }
        return out;
    }

    @Override
    public Duration longest() {
        return longest;
    }

    private static String hours(Duration d) {
        return String.valueOf(d.toMinutes() / 60.0);
    }

    /** A reason as kept: one line, at most {@link #MAX_REASON} characters. */
    private static String clean(String reason) {
        if (reason == null) {
            return "";
        }
        String one = reason.replaceAll("[\\p{Cntrl}]+", " ").strip();
        return one.length() > MAX_REASON ? one.substring(0, MAX_REASON) : one;
    }

    /** After a change: the gate's copy and the file. Holding the lock. */
    private void changed() {
        Map<String, Instant> copy = new LinkedHashMap<>();
        active.forEach((k, e) -> copy.put(k, e.state().until()));
        ends = Map.copyOf(copy);
        save();
    }

    private void save() {
        StringWriter out = new StringWriter();
        try (JsonGenerator g = JSON.createGenerator(out)) {
            g.writeStartArray();
            for (Entry e : active.values()) {
                g.writeStartObject();
                g.writeStringField("id", e.id());
                wayward.http.MuteRequests.fields(g, e.state());
                g.writeEndObject();
            }
            g.writeEndArray();
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }
        Path tmp = file.resolveSibling(FILE + ".tmp");
        try {
            Files.createDirectories(file.getParent());
            try (FileChannel ch = FileChannel.open(tmp, StandardOpenOption.CREATE, StandardOpenOption.WRITE,
                    StandardOpenOption.TRUNCATE_EXISTING)) {
                ch.write(java.nio.ByteBuffer.wrap((out + "\n").getBytes(StandardCharsets.UTF_8)));
                ch.force(true);
            }
            try {
                Files.move(tmp, file, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(tmp, file, StandardCopyOption.REPLACE_EXISTING);
            }
        } catch (IOException e) {
            LOG.error("mutes: cannot keep them in {} ({}); they hold until a restart", file, e.toString());
        }
    }

    private synchronized void load() {
        if (!Files.isRegularFile(file)) {
            return;
        }
        List<Entry> read = new ArrayList<>();
        try (JsonParser p = JSON.createParser(Files.readAllBytes(file))) {
            if (p.nextToken() != JsonToken.START_ARRAY) {
                throw new IOException("not a JSON array");
            }
            while (p.nextToken() == JsonToken.START_OBJECT) {
                Map<String, String> f = new LinkedHashMap<>();
                while (p.nextToken() == JsonToken.FIELD_NAME) {
                    String name = p.currentName();
                    p.nextToken();
                    f.put(name, p.getValueAsString());
                }
                read.add(new Entry(f.get("id"), new MuteState(f.get("camera"), f.get("zone"),
                        Instant.parse(f.get("since")), Instant.parse(f.get("until")), f.get("by"),
                        f.getOrDefault("reason", ""))));
            }
        } catch (IOException | RuntimeException e) {
            LOG.error("mutes: {} is unreadable ({}); no mute is in force, and the file is kept as {}.bad", file,
                    e.toString(), FILE);
            try {
                Files.move(file, file.resolveSibling(FILE + ".bad"), StandardCopyOption.REPLACE_EXISTING);
            } catch (IOException ignored) {
                // the log above says it
            }
            return;
        }
        Instant now = clock.instant();
        for (Entry e : read) {
            MuteState s = e.state();
            active.put(key(s.camera(), s.zone()), e);
            if (!known(s.camera(), s.zone())) {
                end(e, null, "its " + (s.zone() == null ? "camera" : "zone") + " left the config", null);
            } else if (!now.isBefore(s.until())) {
                end(e, null, "", Event.EXPIRED);
            } else {
                LOG.info("{}: still muted until {} (by {}{})", where(s.camera(), s.zone()), s.until(), s.by(),
                        s.reason().isEmpty() ? "" : ": " + s.reason());
            }
        }
        changed();
    }

    /** Runs {@code task} on the mutes' own thread (a caller that must not wait for the file's fsync). */
    public void later(Runnable task) {
        timer.execute(task);
    }

    @Override
    public void close() {
        timer.shutdownNow();
    }
}

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
import java.util.HashMap;
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
    /** Where changes asked of this instance go for the other instances; null: no other instance to tell. */
    private volatile Share share;

    /**
     * Tells the other instances sharing the cameras of one config of a mute started or ended here (through the
     * broker, a retained record per camera or zone; see {@link #mirror}).
     */
    public interface Share {
        void send(String camera, String zone, byte[] record);
    }

    /**
     * One mute in force and the id its phases share; {@code passOn}: asked of this instance's status server, so
     * this instance answers for its record at the broker ({@link #caughtUp}).
     */
    private record Entry(String id, MuteState state, boolean passOn) {
    }

    /** Key "camera" or "camera/zone" → the mute; insertion order. Guarded by this. */
    private final Map<String, Entry> active = new LinkedHashMap<>();
    /** Ids of mutes ended here before their time → that time: a late copy of their record starts nothing. */
    private final Map<String, Instant> endedEarly = new LinkedHashMap<>();
    /** Key → the id of the record read from the broker for it since this instance last subscribed. Guarded by this. */
    private final Map<String, String> atBroker = new HashMap<>();
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

    /**
     * Mutes and early ends asked of this instance through the status server go to {@code share} as records, so an
     * instance watching the camera, now or after a move, keeps them too. MQTT commands are not passed on: every
     * instance reads them itself ({@link #unshared}).
     */
    public void shareWith(Share share) {
        this.share = share;
    }

    /** The same mutes, whose changes are not passed on: for MQTT commands, which every instance reads. */
    public MuteControl unshared() {
        return new MuteControl() {
            @Override
            public MuteState mute(String camera, String zone, Instant until, String by, String reason)
                    throws Refused {
                return Mutes.this.mute(camera, zone, until, by, reason, false);
            }

            @Override
            public MuteState unmute(String camera, String zone, String by, String reason) throws Refused {
                return Mutes.this.unmute(camera, zone, by, reason, false);
            }

            @Override
            public List<MuteState> mutes() {
                return Mutes.this.mutes();
            }

            @Override
            public Duration longest() {
                return longest;
            }
        };
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
    public MuteState mute(String camera, String zone, Instant until, String by, String reason) throws Refused {
        return mute(camera, zone, until, by, reason, true);
    }

    private synchronized MuteState mute(String camera, String zone, Instant until, String by, String reason,
            boolean tell) throws Refused {
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
        Entry e = new Entry(UUID.randomUUID().toString(), new MuteState(camera, zone, now, until, by, why), tell);
        start(e, "");
        if (tell) {
            send(e, null);
        }
        return e.state();
    }

    /** Puts {@code e} in force, logs and raises its start. Holding the lock; saves. */
    private void start(Entry e, String told) {
        MuteState s = e.state();
        active.put(key(s.camera(), s.zone()), e);
        changed();
        LOG.info("{}: muted until {} by {}{}{}", where(s.camera(), s.zone()), s.until(), s.by(),
                s.reason().isEmpty() ? "" : " (" + s.reason() + ")", told);
        if (raisesFor.test(s.camera())) {
            events.accept(Event.control(e.id(), s.camera(), s.zone(), kind(s.zone()), Event.Phase.START, s.since(),
                    Double.NaN, null, new Event.Control(s.until(), s.by(), s.reason())));
        }
    }

    @Override
    public MuteState unmute(String camera, String zone, String by, String reason) throws Refused {
        return unmute(camera, zone, by, reason, true);
    }

    private synchronized MuteState unmute(String camera, String zone, String by, String reason, boolean tell)
            throws Refused {
        Entry e = active.get(key(camera, zone));
        if (e == null) {
            throw new Refused(where(camera, zone) + " is not muted" + (active.isEmpty() ? ""
                    : " (muted: " + String.join(", ", active.keySet()) + ")"));
        }
        String why = clean(reason);
        end(e, by, why, null);
        changed();
        if (tell) {
            send(e, new Event.Control(null, by, why));
        }
        return e.state();
    }

    /** The record of a mute started ({@code ended} null) or ended here, to the other instances. Holding the lock. */
    private void send(Entry e, Event.Control ended) {
        Share to = share;
        if (to == null) {
            return;
        }
        MuteState s = e.state();
        StringWriter out = new StringWriter();
        try (JsonGenerator g = JSON.createGenerator(out)) {
            g.writeStartObject();
            g.writeStringField("state", ended == null ? "muted" : "ended");
            g.writeStringField("id", e.id());
            wayward.http.MuteRequests.fields(g, s);
            if (ended != null) {
                g.writeStringField("ended_at", DateTimeFormatter.ISO_INSTANT.format(clock.instant()));
                g.writeStringField("ended_by", ended.by());
                g.writeStringField("ended_reason", ended.reason());
            }
            g.writeEndObject();
        } catch (IOException x) {
            throw new IllegalStateException(x);
        }
        to.send(s.camera(), s.zone(), out.toString().getBytes(StandardCharsets.UTF_8));
    }

    /**
     * This instance subscribes to the records afresh (it connected to the broker): what the broker holds follows,
     * then {@link #caughtUp}. Call on the mutes' thread, in order with {@link #mirror}.
     */
    public synchronized void subscribing() {
        atBroker.clear();
    }

    /**
     * Every record the broker held at the subscription has been read: a mute asked of this instance whose record
     * the broker does not hold is passed on again. It was asked while the broker was away and this process stopped
     * before it could pass it on (the mute is kept in the data folder, the publish that carried it was not), or the
     * broker came back without its retained messages. A record of the same key under another id wins if it is the
     * newer mute (it replaced this one in {@link #mirror} already) and loses otherwise, as it would have had both
     * been sent in order. Call on the mutes' thread, in order with {@link #mirror}.
     */
    public synchronized void caughtUp() {
        for (Entry e : active.values()) {
            MuteState s = e.state();
            String held = atBroker.get(key(s.camera(), s.zone()));
            if (e.passOn() && !e.id().equals(held) && clock.instant().isBefore(s.until())) {
                LOG.info("{}: the broker does not hold the mute until {} asked here; passed on again",
                        where(s.camera(), s.zone()), s.until());
                send(e, null);
            }
        }
    }

    /**
     * A record another instance sent (or this one, read back): a mute started or ended there through its status
     * server. A mute not known here starts here with the same id (its phases are raised by whichever instance
     * watches the camera), replacing an older one of the same camera or zone; an end ends the mute of that id. A
     * mute whose end time has passed, an unreadable record and one of a camera or zone not in this config change
     * nothing. Never throws.
     */
    public synchronized void mirror(byte[] record) {
        Map<String, String> f;
        try {
            f = fields(record);
        } catch (IOException | RuntimeException bad) {
            LOG.warn("mutes: a shared mute record is unreadable ({}); ignored", wayward.secret.LogText.clean(
                    bad.getMessage()));
            return;
        }
        try {
            String camera = f.get("camera");
            String zone = f.get("zone");
            String id = f.get("id");
            if (camera == null || id == null || !known(camera, zone)) {
                LOG.debug("mutes: a shared record of {} {}, not in this config; ignored", camera, zone);
                return;
            }
            atBroker.put(key(camera, zone), id);
            Entry cur = active.get(key(camera, zone));
            boolean same = cur != null && cur.id().equals(id);
            if ("ended".equals(f.get("state"))) {
                if (same) {
                    end(cur, f.get("ended_by"), clean(f.get("ended_reason")), null);
                    changed();
                }
                return;
            }
            Instant since = Instant.parse(f.get("since"));
            Instant until = Instant.parse(f.get("until"));
            Instant now = clock.instant();
            if (same || !now.isBefore(until) || endedEarly.containsKey(id)
                    || (cur != null && cur.state().since().isAfter(since))) {
                return; // known, over, ended here already, or older than the one in force here
            }
            if (Duration.between(now, until).compareTo(longest) > 0) {
                until = now.plus(longest); // a mute always ends by itself, whatever the other side's bound
            }
            if (cur != null) {
                end(cur, f.get("by"), "replaced by a mute until " + DateTimeFormatter.ISO_INSTANT.format(until), null);
            }
            start(new Entry(id, new MuteState(camera, zone, since, until, f.get("by"), clean(f.get("reason"))), false),
                    " (asked of another instance)");
        } catch (RuntimeException bad) {
            LOG.warn("mutes: a shared mute record is not one ({}); ignored", wayward.secret.LogText.clean(
                    bad.toString()));
        }
    }

    /** A flat JSON object's fields as strings. */
    private static Map<String, String> fields(byte[] json) throws IOException {
        try (JsonParser p = JSON.createParser(json)) {
            if (p.nextToken() != JsonToken.START_OBJECT) {
                throw new IOException("not a JSON object");
            }
            return object(p);
        }
    }

    /** The fields of the object whose start {@code p} has just read, as strings (flat objects only). */
    private static Map<String, String> object(JsonParser p) throws IOException {
        Map<String, String> f = new LinkedHashMap<>();
        while (p.nextToken() == JsonToken.FIELD_NAME) {
            String name = p.currentName();
            p.nextToken();
            f.put(name, p.getValueAsString());
        }
        return f;
    }

    /** Ends {@code e}: removed, logged and raised. Holding the lock; the caller saves. */
    private void end(Entry e, String by, String reason, String endedBy) {
        active.remove(key(e.state().camera(), e.state().zone()));
        Instant now = clock.instant();
        MuteState s = e.state();
        if (now.isBefore(s.until())) {
            endedEarly.put(e.id(), s.until());
        }
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
        endedEarly.values().removeIf(until -> !now.isBefore(until));
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
                if (e.passOn()) {
                    g.writeBooleanField("pass_on", true);
                }
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
                Map<String, String> f = object(p);
                read.add(new Entry(f.get("id"), new MuteState(f.get("camera"), f.get("zone"),
                        Instant.parse(f.get("since")), Instant.parse(f.get("until")), f.get("by"),
                        f.getOrDefault("reason", "")), "true".equals(f.get("pass_on"))));
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
    @Override
    public void later(Runnable task) {
        timer.execute(task);
    }

    @Override
    public void close() {
        timer.shutdownNow();
    }
}

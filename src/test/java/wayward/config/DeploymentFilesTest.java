package wayward.config;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.dataformat.yaml.YAMLMapper;
import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.xml.parsers.DocumentBuilderFactory;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import org.tomlj.Toml;
import org.tomlj.TomlParseResult;
import org.w3c.dom.NodeList;
import wayward.delivery.RecentEvents;
import wayward.http.EmptySite;
import wayward.http.HttpConfig;
import wayward.http.StatusServer;

/**
 * The deployment files held against the service's own code: the Kubernetes example
 * ({@code conf/kubernetes/wayward.yaml}: the site config in a ConfigMap, the status token's Secret, a headless
 * Service and the StatefulSet) and the systemd units beside the README. Each check names the outside source
 * of the rule it applies and says in its message what disagreed.
 */
@Timeout(value = 60, unit = TimeUnit.SECONDS)
class DeploymentFilesTest {
    private static final Path PROJECT = Path.of(System.getProperty("wayward.project.dir", ".")).toAbsolutePath();
    private static final Path KUBERNETES = PROJECT.resolve("conf/kubernetes/wayward.yaml");
    private static final Path TEMPLATE_UNIT = PROJECT.resolve("systemd/wayward@.service");
    private static final Path UNIT = PROJECT.resolve("systemd/wayward.service");
    private static final Path README = PROJECT.resolve("README.md");
    private static final Path ARCHIVE = PROJECT.resolve("src/assembly/archive.xml");
    private static final String CONFIG_OPTION = "--config";
    private static final String CACHE_DIR_OPTION = "-Dorg.bytedeco.javacpp.cachedir=";
    private static final String HEAP_OPTION = "-Xmx";
    private static final String VECTOR_OPTION = "--add-modules";
    private static final String VECTOR_MODULE = "jdk.incubator.vector";
    private static final String SCRAPE_START = "# --- scrape job ---";
    private static final String SCRAPE_END = "# --- end of scrape job ---";
    /** The JDK's java.io.tmpdir on Linux when not set (from memory; Netty unpacks its epoll library there). */
    private static final String JAVA_TMP_DIR = "/tmp";
    /** Issue 21: a dead host's cameras are watched again within this many seconds. */
    private static final double TAKE_OVER_TARGET_SECONDS = 15;
    /** Issue 21: what a camera's start adds to the broker's notice (a second or two). */
    private static final double CAMERA_START_SECONDS = 2;
    /**
     * Room on a data volume beyond the evidence bound and the outbox: the event log, learned headings and the
     * native-library cache (FFmpeg's libraries are a few hundred MB unpacked; from memory).
     */
    private static final long DATA_HEADROOM_BYTES = 1L << 30;
    private static final Duration REQUEST_TIMEOUT = Duration.ofSeconds(10);

    private static String yamlText;
    private static Map<String, JsonNode> byKind;
    private static JsonNode statefulSet;
    private static JsonNode podSpec;
    private static JsonNode container;

    @BeforeAll
    static void readManifest() throws IOException {
        yamlText = Files.readString(KUBERNETES, StandardCharsets.UTF_8);
        byKind = new LinkedHashMap<>();
        // several documents separated by "---" (YAML 1.2 §9.1.2); Kubernetes reads each as one object
        try (com.fasterxml.jackson.databind.MappingIterator<JsonNode> it = new YAMLMapper().readerFor(JsonNode.class)
                .readValues(yamlText)) {
            while (it.hasNext()) {
                JsonNode doc = it.next();
                if (doc == null || doc.isNull() || doc.isEmpty()) {
                    continue;
                }
                String kind = doc.path("kind").asText();
                assertTrue(byKind.put(kind, doc) == null, "wayward.yaml: more than one " + kind);
            }
        }
        assertEquals(List.of("ConfigMap", "Secret", "Service", "StatefulSet"), List.copyOf(byKind.keySet()),
                "wayward.yaml: the objects it holds");
        statefulSet = byKind.get("StatefulSet");
        podSpec = need(statefulSet, "/spec/template/spec");
        JsonNode containers = need(podSpec, "/containers");
        assertEquals(1, containers.size(), "StatefulSet: containers in the pod");
        container = containers.get(0);
    }

    @Test
    void podNamesAreTheInstancesAndValidInstanceIds() {
        // Kubernetes StatefulSet docs: a StatefulSet of N replicas names its pods <name>-0 … <name>-(N-1)
        List<String> pods = podNames();
        assertEquals(pods, instancesFromEnv(),
                "WAYWARD_INSTANCES against the StatefulSet's pod names (name " + statefulSet.at("/metadata/name")
                        + ", replicas " + statefulSet.at("/spec/replicas") + ")");
        for (String pod : pods) {
            assertTrue(TableReader.isId(pod), "pod name " + pod + " is not a wayward instance id ("
                    + TableReader.ID_EXPECTED + ")");
        }
        // Kubernetes downward API: fieldRef metadata.name is the pod's name
        JsonNode instance = env("WAYWARD_INSTANCE");
        assertEquals("metadata.name", instance.at("/valueFrom/fieldRef/fieldPath").asText(),
                "WAYWARD_INSTANCE must come from the pod's name, but is " + instance);
    }

    @Test
    void statefulSetHasItsHeadlessServiceAndItsLabelsMatch() {
        JsonNode service = byKind.get("Service");
        // Kubernetes StatefulSet docs: spec.serviceName names the headless Service (clusterIP None) that gives
        // each pod its DNS name
        assertEquals(service.at("/metadata/name").asText(), statefulSet.at("/spec/serviceName").asText(),
                "StatefulSet spec.serviceName against the Service's name");
        assertEquals("None", service.at("/spec/clusterIP").asText(), "Service spec.clusterIP (headless: None)");
        JsonNode labels = need(statefulSet, "/spec/template/metadata/labels");
        // Kubernetes API apps/v1: the selector must match the pod template's labels, or the object is refused;
        // a Service's selector picks pods by their labels
        assertLabelsMatch(need(statefulSet, "/spec/selector/matchLabels"), labels, "StatefulSet spec.selector");
        assertLabelsMatch(need(service, "/spec/selector"), labels, "Service spec.selector");
        // Kubernetes StatefulSet docs: OrderedReady starts pod N+1 only once pod N is ready; /health/ready is 503
        // while a camera is lost, so one lost camera would keep the later pods from starting
        assertEquals("Parallel", statefulSet.at("/spec/podManagementPolicy").asText(),
                "StatefulSet spec.podManagementPolicy");
    }

    @Test
    void portsAgreeAndProbesAreAnsweredWithoutTheToken(@TempDir Path dir) throws Exception {
        String http = env("WAYWARD_HTTP").path("value").asText();
        int colon = http.lastIndexOf(':');
        assertTrue(colon > 0, "WAYWARD_HTTP " + http + " is not host:port");
        // Kubernetes probes connect to the pod's IP, so the server must listen on all addresses (common practice)
        assertEquals("0.0.0.0", http.substring(0, colon), "WAYWARD_HTTP's host");
        int port = Integer.parseInt(http.substring(colon + 1));
        JsonNode ports = need(container, "/ports");
        assertEquals(1, ports.size(), "container ports");
        assertEquals(port, ports.get(0).path("containerPort").asInt(), "containerPort against WAYWARD_HTTP " + http);
        assertEquals(HttpConfig.DEFAULT_PORT, port, "WAYWARD_HTTP's port against HttpConfig.DEFAULT_PORT");
        // Kubernetes API core/v1: a probe's or Service's port is a number or the name of a container port
        JsonNode liveness = need(container, "/livenessProbe/httpGet");
        JsonNode readiness = need(container, "/readinessProbe/httpGet");
        assertEquals(port, containerPort(liveness.path("port")), "livenessProbe port against WAYWARD_HTTP " + http);
        assertEquals(port, containerPort(readiness.path("port")), "readinessProbe port against WAYWARD_HTTP " + http);
        assertEquals(port, containerPort(byKind.get("Service").at("/spec/ports/0/targetPort")),
                "Service targetPort against WAYWARD_HTTP " + http);

        JsonNode scrape = scrapeJob();
        // Prometheus docs, scrape_config: the kubernetes_sd pod role labels each target with its container port's
        // name and the pod's labels; the job keeps only ours
        String portName = ports.get(0).path("name").asText();
        String appLabel = need(statefulSet, "/spec/template/metadata/labels").path("app.kubernetes.io/name")
                .asText();
        List<String> keeps = new ArrayList<>();
        for (JsonNode r : scrape.path("relabel_configs")) {
            if (r.path("action").asText().equals("keep")) {
                keeps.add(r.at("/source_labels/0").asText() + "=" + r.path("regex").asText());
            }
        }
        assertEquals(List.of("__meta_kubernetes_pod_label_app_kubernetes_io_name=" + appLabel,
                "__meta_kubernetes_pod_container_port_name=" + portName), keeps,
                "scrape job's keep rules against the pods' label and the container port's name");
        assertEquals("Bearer", scrape.at("/authorization/type").asText(), "scrape job's authorization type");

        // the real status server, with the token the pods get, on loopback: the probe paths need no token,
        // the scrape path does (so a probe on it would fail), and the token of the Secret opens it
        byte[] token = secretValue(tokenKey()).getBytes(StandardCharsets.UTF_8);
        HttpConfig loopback = new HttpConfig("127.0.0.1", 0, dir.resolve("token").toString(), token,
                HttpConfig.DEFAULT_MAX_CONNECTIONS);
        HttpClient client = HttpClient.newBuilder().connectTimeout(REQUEST_TIMEOUT).build();
        try (StatusServer server = StatusServer.start(loopback, new EmptySite(new RecentEvents(10)))) {
            for (JsonNode probe : List.of(liveness, readiness)) {
                assertTrue(probe.path("scheme").asText("HTTP").equals("HTTP"), "probe scheme: " + probe);
                String path = probe.path("path").asText();
                HttpResponse<String> r = get(client, server, path, null);
                assertEquals(200, r.statusCode(), "probe path " + path + " without a token: " + r.body());
            }
            String metrics = scrape.path("metrics_path").asText();
            assertEquals(401, get(client, server, metrics, null).statusCode(),
                    "scrape path " + metrics + " without a token (the job must carry one)");
            HttpResponse<String> r = get(client, server, metrics, new String(token, StandardCharsets.UTF_8));
            assertEquals(200, r.statusCode(), "scrape path " + metrics + " with the Secret's token: " + r.body());
            // Prometheus text exposition format: metadata lines start with "# TYPE"
            assertTrue(r.body().contains("# TYPE "), "scrape path " + metrics + " answers no Prometheus text");
        }
    }

    @Test
    void configMapLoadsForEveryPodAndAgreesWithTheMounts(@TempDir Path dir) throws Exception {
        JsonNode configMap = byKind.get("ConfigMap");
        // the container's command reads the file where the ConfigMap's volume puts its key (Kubernetes docs:
        // a configMap volume holds one file per key, named by the key)
        String configPath = commandOption(CONFIG_OPTION);
        JsonNode configVolume = volumeWith("configMap", configMap.at("/metadata/name").asText());
        String configMount = mountPath(configVolume.path("name").asText());
        assertTrue(configPath.startsWith(configMount + "/"), "--config " + configPath + " is not in the ConfigMap's"
                + " mount " + configMount);
        String key = configPath.substring(configMount.length() + 1);
        JsonNode tomlNode = configMap.at("/data/" + key);
        assertFalse(tomlNode.isMissingNode(), "ConfigMap has no key " + key + " (--config " + configPath + ")");
        String toml = tomlNode.asText();

        TomlParseResult raw = Toml.parse(toml);
        assertTrue(raw.errors().isEmpty(), "ConfigMap's TOML: " + raw.errors());
        String dataDir = raw.getString("service.data_dir");
        String dataMount = mountPath(need(statefulSet, "/spec/volumeClaimTemplates/0/metadata/name").asText());
        assertEquals(dataMount, dataDir, "[service] data_dir against the data volume's mount path");
        String tokenFile = raw.getString("service.token_file");
        JsonNode secretVolume = volumeWith("secret", byKind.get("Secret").at("/metadata/name").asText());
        String secretMount = mountPath(secretVolume.path("name").asText());
        assertEquals(secretMount + "/" + tokenKey(), tokenFile,
                "[service] token_file against the Secret's mount path and key");

        // the file as each pod reads it; the one change is the token file's place, since /etc/wayward/secret
        // does not exist here: the Secret's value goes to a file of its own
        Path token = dir.resolve("token");
        Files.writeString(token, secretValue(tokenKey()), StandardCharsets.UTF_8);
        // as the pod's Secret volume: readable by the service alone (else the loader warns)
        Files.setPosixFilePermissions(token, java.nio.file.attribute.PosixFilePermissions.fromString("r--------"));
        String tokenLine = "token_file = \"" + tokenFile + "\"";
        assertEquals(1, count(toml, tokenLine), "the ConfigMap's TOML must hold " + tokenLine + " once");
        Path file = dir.resolve(key);
        Files.writeString(file, toml.replace(tokenLine, "token_file = \"" + token + "\""), StandardCharsets.UTF_8);

        String clientId = raw.getString("mqtt.client_id");
        assertNotNull(clientId, "[mqtt] client_id: set it, or each pod's id is cut from wayward-<pod name>");
        String http = env("WAYWARD_HTTP").path("value").asText();
        for (String pod : podNames()) {
            // the pod's host name is its name (Kubernetes docs: pod's hostname defaults to metadata.name)
            Environment podEnv = new Environment(pod, env("WAYWARD_INSTANCES").path("value").asText(), http, pod);
            SiteConfig c;
            try {
                c = ConfigLoader.load(file, podEnv);
            } catch (ConfigException e) {
                fail("ConfigMap's TOML for pod " + pod + ": " + e.errors());
                return;
            }
            assertEquals(new ShardConfig(pod, podNames(), true), c.shard(), "pod " + pod + ": its share, membership through the broker");
            assertEquals(Path.of(dataMount, pod), c.dataDir(), "pod " + pod + ": data folder against the mount "
                    + dataMount + " and its name");
            assertEquals("0.0.0.0:" + containerPort(container.at("/ports/0/name")),
                    c.http().host() + ":" + c.http().port(), "pod " + pod + ": status server against the container"
                    + " port");
            assertArrayEquals(secretValue(tokenKey()).getBytes(StandardCharsets.UTF_8), c.http().token(),
                    "pod " + pod + ": status token against the Secret");
            // MQTT 3.1.1 §3.1.3.1: 1 to 23 characters every broker accepts; ours is cut to fit, which must not
            // cut off the pod's name (the status topic names the pod by it)
            assertEquals(clientId + "-" + pod, c.mqtt().clientId(), "pod " + pod + ": MQTT client id");
            // the will, then the grace the others give an offline status (wayward.service.Membership)
            double noticeSeconds = c.mqtt().keepAliveSeconds() * 1.5
                    + wayward.service.Membership.OFFLINE_GRACE_MILLIS / 1000.0;
            // MQTT 3.1.1 §3.1.2.10: the broker drops a client silent for 1.5 × its keep-alive (its will fires)
            assertTrue(noticeSeconds + CAMERA_START_SECONDS < TAKE_OVER_TARGET_SECONDS, "keep_alive_seconds "
                    + c.mqtt().keepAliveSeconds() + ": a dead pod's cameras wait " + noticeSeconds + " s + the"
                    + " camera's start, not under " + TAKE_OVER_TARGET_SECONDS + " s");
            long needBytes = (long) (c.clips().keepGigabytes() * 1e9) + c.outboxMaxBytes() + DATA_HEADROOM_BYTES;
            long storage = quantityBytes(need(statefulSet,
                    "/spec/volumeClaimTemplates/0/spec/resources/requests/storage").asText());
            assertTrue(storage >= needBytes, "data volume " + storage + " bytes is smaller than keep_gb + outbox"
                    + " max_mb + headroom = " + needBytes + " bytes");
        }
    }

    @Test
    void containerRunsUnprivilegedAndWritesOnlyToItsVolumes() {
        // Kubernetes docs, Pod Security Standards (restricted): non-root, no privilege escalation, capabilities
        // dropped, a seccomp profile
        assertTrue(podSpec.at("/securityContext/runAsNonRoot").asBoolean(), "pod runAsNonRoot");
        assertEquals("RuntimeDefault", podSpec.at("/securityContext/seccompProfile/type").asText(),
                "pod seccompProfile");
        assertTrue(container.at("/securityContext/readOnlyRootFilesystem").asBoolean(),
                "container readOnlyRootFilesystem");
        assertFalse(container.at("/securityContext/allowPrivilegeEscalation").asBoolean(true),
                "container allowPrivilegeEscalation");
        assertEquals("ALL", container.at("/securityContext/capabilities/drop/0").asText(),
                "container capabilities.drop");
        // with a read-only root, every folder the process writes must be a writable volume
        List<String> writable = writableMounts();
        String cacheDir = commandOption(CACHE_DIR_OPTION);
        for (String p : List.of(cacheDir, container.path("workingDir").asText(), JAVA_TMP_DIR)) {
            assertTrue(writable.stream().anyMatch(m -> p.equals(m) || p.startsWith(m + "/")),
                    p + " is not on a writable volume (writable: " + writable + ")");
        }
    }

    @Test
    void stopTimeAndMemoryFitTheService() throws IOException {
        // systemd.service(5) TimeoutStopSec: the time the unit gives an orderly stop; Kubernetes sends SIGTERM and
        // kills after terminationGracePeriodSeconds
        int stopSeconds = Integer.parseInt(unitValue(Files.readString(TEMPLATE_UNIT, StandardCharsets.UTF_8),
                "TimeoutStopSec"));
        int grace = podSpec.path("terminationGracePeriodSeconds").asInt(-1);
        assertTrue(grace >= stopSeconds, "terminationGracePeriodSeconds " + grace + " is shorter than the unit's"
                + " TimeoutStopSec " + stopSeconds);
        String heap = commandOption(HEAP_OPTION);
        long heapBytes = jvmSizeBytes(heap);
        long request = quantityBytes(need(container, "/resources/requests/memory").asText());
        long limit = quantityBytes(need(container, "/resources/limits/memory").asText());
        // README "Sizing a server": about 150 MB outside the cameras, plus native memory per camera
        assertTrue(request > heapBytes, "memory request " + request + " does not exceed the heap -Xmx" + heap);
        assertTrue(limit >= request, "memory limit " + limit + " is below the request " + request);
        assertFalse(container.at("/resources/requests/cpu").isMissingNode(), "cpu request missing");
    }

    @Test
    void everyWayOfStartingTheServiceGivesTheFlowItsVectorModule() throws IOException {
        // the flow's inner loops run on vector instructions only where java has the module
        // (FlowEstimator.instructions); java(1): --add-modules takes the module names as the next argument
        for (Path unit : List.of(UNIT, TEMPLATE_UNIT)) {
            String exec = unitValue(Files.readString(unit, StandardCharsets.UTF_8), "ExecStart");
            assertTrue(exec.contains(" " + VECTOR_OPTION + " " + VECTOR_MODULE + " "), unit.getFileName()
                    + ": ExecStart lacks " + VECTOR_OPTION + " " + VECTOR_MODULE + ": " + exec);
        }
        assertEquals(VECTOR_MODULE, commandOption(VECTOR_OPTION), "container command");
        String launcher = Files.readString(PROJECT.resolve("src/dist/wayward"), StandardCharsets.UTF_8);
        assertTrue(launcher.contains("run|") && launcher.contains(VECTOR_OPTION + " " + VECTOR_MODULE),
                "bin/wayward does not give run the vector module");
    }

    @Test
    void systemdUnitsAgreeWithTheReadmeAndTheArchiveShipsThem() throws Exception {
        String readme = Files.readString(README, StandardCharsets.UTF_8);
        String readmeConfig = group(readme, "wayward check --config (\\S+)", "README's check --config");
        String readmeDataDir = group(readme, "Set `data_dir = \"([^\"]+)\"`", "README's data_dir");
        for (Path unit : List.of(UNIT, TEMPLATE_UNIT)) {
            String text = Files.readString(unit, StandardCharsets.UTF_8);
            String exec = unitValue(text, "ExecStart");
            assertEquals(readmeConfig, group(exec, "--config (\\S+)", unit + " ExecStart --config"),
                    unit.getFileName() + ": ExecStart's config against README");
            // systemd.exec(5): StateDirectory= names a folder below /var/lib
            assertEquals(readmeDataDir, "/var/lib/" + unitValue(text, "StateDirectory"),
                    unit.getFileName() + ": StateDirectory against README's data_dir");
            String cache = group(exec, Pattern.quote(CACHE_DIR_OPTION) + "(\\S+)", unit + " JavaCPP cache folder");
            assertTrue(cache.startsWith(readmeDataDir + "/"), unit.getFileName() + ": JavaCPP cache " + cache
                    + " is not below the state folder " + readmeDataDir + ", the one folder it may write");
        }
        // systemd.unit(5): %i is the instance name, the part after "@"
        assertTrue(Files.readString(TEMPLATE_UNIT, StandardCharsets.UTF_8).contains(
                "\nEnvironment=WAYWARD_INSTANCE=%i\n"), "wayward@.service does not set WAYWARD_INSTANCE from %i");

        // Maven Assembly Plugin, assembly descriptor 2.2.0: <file><source> lists each file packed
        NodeList sources = DocumentBuilderFactory.newInstance().newDocumentBuilder().parse(ARCHIVE.toFile())
                .getElementsByTagName("source");
        List<String> packed = new ArrayList<>();
        for (int i = 0; i < sources.getLength(); i++) {
            packed.add(sources.item(i).getTextContent().trim());
        }
        for (String f : List.of("systemd/wayward.service", "systemd/wayward@.service",
                "conf/kubernetes/wayward.yaml")) {
            assertTrue(packed.contains(f), "archive.xml does not pack " + f + " (packs " + packed + ")");
        }
    }

    // ---- reading the manifest ----

    /** The node at a JSON pointer (RFC 6901), failing with the pointer when absent. */
    private static JsonNode need(JsonNode n, String pointer) {
        JsonNode v = n.at(pointer);
        if (v.isMissingNode() || v.isNull()) {
            fail("wayward.yaml: " + n.path("kind").asText("object") + " has no " + pointer);
        }
        return v;
    }

    private static List<String> podNames() {
        String name = need(statefulSet, "/metadata/name").asText();
        int replicas = need(statefulSet, "/spec/replicas").asInt();
        List<String> out = new ArrayList<>();
        for (int i = 0; i < replicas; i++) {
            out.add(name + "-" + i);
        }
        return out;
    }

    private static List<String> instancesFromEnv() {
        List<String> out = new ArrayList<>();
        for (String s : env("WAYWARD_INSTANCES").path("value").asText().split(",", -1)) {
            out.add(s.trim());
        }
        return out;
    }

    /** The container's env entry of this name. */
    private static JsonNode env(String name) {
        for (JsonNode e : container.path("env")) {
            if (e.path("name").asText().equals(name)) {
                return e;
            }
        }
        return fail("container env has no " + name);
    }

    /** The container port a probe's or Service's port refers to (number, or a container port's name). */
    private static int containerPort(JsonNode ref) {
        if (ref.isInt()) {
            return ref.asInt();
        }
        for (JsonNode p : container.path("ports")) {
            if (p.path("name").asText().equals(ref.asText())) {
                return p.path("containerPort").asInt();
            }
        }
        return fail("no container port named " + ref);
    }

    /** The value after an option in the container's command: "--config" and the next item, or "-Dx=" joined. */
    private static String commandOption(String option) {
        List<String> args = new ArrayList<>();
        need(container, "/command").forEach(a -> args.add(a.asText()));
        for (int i = 0; i < args.size(); i++) {
            String a = args.get(i);
            if (a.equals(option) && i + 1 < args.size()) {
                return args.get(i + 1);
            }
            if (!a.equals(option) && a.startsWith(option)) {
                return a.substring(option.length());
            }
        }
        return fail("container command has no " + option + ": " + args);
    }

    /** The pod volume whose {@code kind} ("configMap", "secret") names this object. */
    private static JsonNode volumeWith(String kind, String objectName) {
        String nameKey = kind.equals("secret") ? "secretName" : "name";
        for (JsonNode v : podSpec.path("volumes")) {
            if (v.path(kind).path(nameKey).asText().equals(objectName)) {
                return v;
            }
        }
        return fail("no pod volume of " + kind + " " + objectName);
    }

    private static String mountPath(String volume) {
        for (JsonNode m : container.path("volumeMounts")) {
            if (m.path("name").asText().equals(volume)) {
                return m.path("mountPath").asText();
            }
        }
        return fail("volume " + volume + " is not mounted in the container");
    }

    /** Mount paths of volumes the container may write: emptyDir volumes and the claim templates' volumes. */
    private static List<String> writableMounts() {
        Map<String, Boolean> writable = new HashMap<>();
        for (JsonNode v : podSpec.path("volumes")) {
            writable.put(v.path("name").asText(), v.has("emptyDir"));
        }
        for (JsonNode t : statefulSet.at("/spec/volumeClaimTemplates")) {
            writable.put(t.at("/metadata/name").asText(), true);
        }
        List<String> out = new ArrayList<>();
        for (JsonNode m : container.path("volumeMounts")) {
            if (writable.getOrDefault(m.path("name").asText(), false) && !m.path("readOnly").asBoolean(false)) {
                out.add(m.path("mountPath").asText());
            }
        }
        return out;
    }

    /** The key of the Secret's single entry: the token. */
    private static String tokenKey() {
        JsonNode s = byKind.get("Secret");
        JsonNode data = s.has("stringData") ? s.path("stringData") : s.path("data");
        assertEquals(1, data.size(), "Secret: entries (expected the token alone)");
        return data.properties().iterator().next().getKey();
    }

    /** A Secret entry's value: stringData as written, data base64-decoded (Kubernetes API core/v1 Secret). */
    private static String secretValue(String key) {
        JsonNode s = byKind.get("Secret");
        if (s.has("stringData")) {
            return s.at("/stringData/" + key).asText();
        }
        return new String(java.util.Base64.getDecoder().decode(s.at("/data/" + key).asText()),
                StandardCharsets.UTF_8);
    }

    /** The Prometheus scrape job written in the comment between the markers, read as YAML (one list item). */
    private static JsonNode scrapeJob() throws IOException {
        int from = yamlText.indexOf(SCRAPE_START);
        int to = yamlText.indexOf(SCRAPE_END);
        assertTrue(from >= 0 && to > from, "wayward.yaml: no scrape job between " + SCRAPE_START + " and "
                + SCRAPE_END);
        StringBuilder job = new StringBuilder();
        for (String line : yamlText.substring(from + SCRAPE_START.length(), to).split("\n", -1)) {
            job.append(line.startsWith("# ") ? line.substring(2) : line.replaceFirst("^#", "")).append('\n');
        }
        JsonNode list = new YAMLMapper().readTree(job.toString());
        assertEquals(1, list.size(), "scrape jobs in the comment");
        return list.get(0);
    }

    /** Bytes of a Kubernetes quantity such as 768Mi, 25Gi or 2G (Kubernetes API: resource.Quantity). */
    static long quantityBytes(String q) {
        Matcher m = Pattern.compile("([0-9]+)([KMGTP]i|[kMGTP])?").matcher(q);
        assertTrue(m.matches(), "not a byte quantity: " + q);
        long n = Long.parseLong(m.group(1));
        String unit = m.group(2) == null ? "" : m.group(2);
        String order = "KMGTP";
        if (unit.isEmpty()) {
            return n;
        }
        int power = order.indexOf(Character.toUpperCase(unit.charAt(0))) + 1;
        long base = unit.endsWith("i") ? 1024 : 1000;
        long f = 1;
        for (int i = 0; i < power; i++) {
            f *= base;
        }
        return n * f;
    }

    /** Bytes of a JVM size option's value such as 512m (the java launcher's docs: k, m, g are 1024-based). */
    static long jvmSizeBytes(String size) {
        Matcher m = Pattern.compile("([0-9]+)([kKmMgG]?)").matcher(size);
        assertTrue(m.matches(), "not a JVM size: " + size);
        String unit = m.group(2).toLowerCase(java.util.Locale.ROOT);
        int power = unit.isEmpty() ? 0 : "kmg".indexOf(unit) + 1;
        return Long.parseLong(m.group(1)) << (10 * power);
    }

    // ---- other files ----

    /** A systemd unit's value of a key (the last assignment wins, systemd.syntax(7)); fails when absent. */
    private static String unitValue(String unit, String key) {
        String value = null;
        for (String line : unit.split("\n", -1)) {
            if (line.startsWith(key + "=")) {
                value = line.substring(key.length() + 1).trim();
            }
        }
        assertNotNull(value, "unit has no " + key + "=");
        return value;
    }

    private static String group(String text, String regex, String what) {
        Matcher m = Pattern.compile(regex).matcher(text);
        assertTrue(m.find(), what + ": not found (/" + regex + "/)");
        return m.group(1);
    }

    private static int count(String text, String part) {
        int n = 0;
        for (int i = text.indexOf(part); i >= 0; i = text.indexOf(part, i + 1)) {
            n++;
        }
        return n;
    }

    private static HttpResponse<String> get(HttpClient client, StatusServer server, String path, String token)
            throws IOException, InterruptedException {
        HttpRequest.Builder b = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + server.port() + path))
                .timeout(REQUEST_TIMEOUT).GET();
        if (token != null) {
            // RFC 6750 §2.1: Authorization: Bearer <token>
            b.header("Authorization", "Bearer " + token);
        }
        return client.send(b.build(), HttpResponse.BodyHandlers.ofString(StandardCharsets.UTF_8));
    }

    private static void assertLabelsMatch(JsonNode selector, JsonNode labels, String what) {
        assertFalse(selector.isEmpty(), what + " is empty");
        for (Map.Entry<String, JsonNode> e : selector.properties()) {
            assertEquals(e.getValue().asText(), labels.path(e.getKey()).asText(null),
                    what + " " + e.getKey() + " against the pod template's labels");
        }
    }
}

#!/usr/bin/python3
"""Checks deploy/ with what runs on this machine (no container engine, no cluster):

- systemd: `systemd-analyze verify` on the unit (pointed at a staged `make install`), its exposure
  score from `systemd-analyze security --offline` below a threshold, the hardening the unit must
  keep, and every GREYBODY_* variable it sets being one that `greybodyd --help` knows;
- container: the base images and the non-root user, the files its COPY lines name, its build
  stage's commands run on exactly those files, and its runtime packages providing every shared
  library the built server is linked against;
- Kubernetes: every manifest parses as YAML; the Deployment's probes, resources, ports and
  security context; the Service and the autoscaler point at the Deployment;
- nginx: `nginx -t` on the shipped configuration.

Run: make test-deploy (or /usr/bin/python3 tests/deploy/check_deploy.py from the project root).
"""
import glob
import os
import pathlib
import re
import shlex
import shutil
import subprocess
import sys
import tempfile

import yaml

HERE = pathlib.Path(__file__).resolve().parent
ROOT = HERE.parent.parent
DEPLOY = ROOT / "deploy"
sys.dont_write_bytecode = True  # no __pycache__ beside the sources
sys.path.insert(0, str(ROOT / "tests" / "support"))
sys.path.insert(0, str(HERE))
from greybodyd_process import default_binary  # noqa: E402
from nginx_harness import Nginx, SHIPPED_SITE  # noqa: E402
from suite_report import Skip, SuiteReport  # noqa: E402

UNIT = DEPLOY / "systemd" / "greybodyd@.service"
CONTAINERFILE = DEPLOY / "container" / "Containerfile"
KUBERNETES = DEPLOY / "kubernetes"
INSTALLED_BINARY = "/usr/local/bin/greybodyd"
# systemd-analyze security rates exposure from 0 (locked down) to 100 (shown as 0.0–10.0);
# above 2.0 a hardening setting has been lost.
EXPOSURE_THRESHOLD = 20
# Present in every debian:12-slim image (dependencies of its essential packages; from memory).
BASE_IMAGE_PACKAGES = {"libc6", "libgcc-s1"}


def run(command, **options):
    return subprocess.run(command, capture_output=True, text=True, check=False, **options)


def server_help():
    result = run([str(default_binary()), "--help"])
    if result.returncode != 0:
        raise RuntimeError(f"{default_binary()} --help failed: {result.stderr}")
    return result.stdout


def known_flags_and_variables():
    text = server_help()
    return (set(re.findall(r"^\s+(--[a-z-]+) VALUE", text, re.MULTILINE)),
            set(re.findall(r"\((GREYBODY_[A-Z_]+)\)", text)))


# ---- systemd -----------------------------------------------------------------------------

def unit_settings():
    settings = {}
    for line in UNIT.read_text(encoding="utf-8").splitlines():
        if "=" in line and not line.lstrip().startswith(("#", ";", "[")):
            key, value = line.split("=", 1)
            settings.setdefault(key.strip(), []).append(value.strip())
    return settings


def check_unit_verifies(staging):
    """systemd-analyze verify on an instance of the unit whose binary is the staged install."""
    if staging is None:
        return ["no staged install to point the unit at (the container build stage failed)"]
    work = pathlib.Path(tempfile.mkdtemp(prefix="greybody-unit-"))
    try:
        instance = work / "greybodyd@8081.service"
        staged_binary = staging / INSTALLED_BINARY.lstrip("/")
        instance.write_text(UNIT.read_text(encoding="utf-8").replace(INSTALLED_BINARY,
                                                                       str(staged_binary)))
        result = run(["systemd-analyze", "verify", str(instance)])
        output = (result.stdout + result.stderr).strip()
        if re.search(r"Failed to (initialize|allocate) manager", output):
            raise Skip("systemd-analyze cannot start its manager in this environment: " + output)
        problems = []
        if result.returncode != 0:
            problems.append(f"systemd-analyze verify exit {result.returncode}: {output}")
        elif output:
            problems.append(f"systemd-analyze verify warns: {output}")  # e.g. an unknown key
        result = run(["systemd-analyze", "security", "--offline=yes",
                      f"--threshold={EXPOSURE_THRESHOLD}", str(instance)])
        summary = [line for line in result.stdout.splitlines() if "exposure level" in line]
        if result.returncode != 0:
            problems.append(f"exposure above {EXPOSURE_THRESHOLD / 10}: {summary or result.stderr}")
        return problems
    finally:
        shutil.rmtree(work, ignore_errors=True)


def check_unit_hardening():
    settings = unit_settings()
    required = {"NoNewPrivileges": "yes", "ProtectSystem": "strict", "Restart": "on-failure",
                "PrivateTmp": "yes", "ProtectHome": "yes", "CapabilityBoundingSet": ""}
    problems = [f"{key}={value} is missing" for key, value in required.items()
                if value not in settings.get(key, [])]
    own_user = settings.get("DynamicUser") == ["yes"] or any(
        user not in ("", "root", "0") for user in settings.get("User", []))
    if not own_user:
        problems.append("neither DynamicUser=yes nor a User= other than root")
    exec_start = settings.get("ExecStart", [""])[0]
    if not exec_start.startswith(INSTALLED_BINARY + " ") or "--listen 127.0.0.1:%i" not in exec_start:
        problems.append(f"ExecStart should run {INSTALLED_BINARY} --listen 127.0.0.1:%i: {exec_start}")
    environment = dict(item.split("=", 1) for item in settings.get("Environment", []))
    drain = int(environment.get("GREYBODY_DRAIN_TIMEOUT", "10"))
    stop = int(settings.get("TimeoutStopSec", ["90"])[0])
    if stop <= drain:
        problems.append(f"TimeoutStopSec={stop} leaves no time for the {drain} s drain")
    _, variables = known_flags_and_variables()
    problems += [f"Environment={name}: greybodyd --help does not know this variable"
                 for name in environment if name not in variables]
    return problems


# ---- container -----------------------------------------------------------------------------

def containerfile_stages():
    """[(base image, alias, [(instruction, argument text)])] with continuation lines joined."""
    text = re.sub(r"\\\n", " ", CONTAINERFILE.read_text(encoding="utf-8"))
    stages = []
    for line in text.splitlines():
        line = line.strip()
        if not line or line.startswith("#"):
            continue
        instruction, _, argument = line.partition(" ")
        instruction = instruction.upper()
        if instruction == "FROM":
            words = argument.split()
            alias = words[2] if len(words) == 3 and words[1].upper() == "AS" else None
            stages.append((words[0], alias, []))
        elif stages:
            stages[-1][2].append((instruction, argument.strip()))
    return stages


def check_container_shape():
    stages = containerfile_stages()
    problems = []
    if len(stages) < 2:
        return [f"{len(stages)} stage(s): expected a build stage and a runtime stage"]
    problems += [f"stage {i} is based on {image}, not debian:12-slim"
                 for i, (image, _, _) in enumerate(stages) if image != "debian:12-slim"]
    runtime = stages[-1][2]
    users = [argument for instruction, argument in runtime if instruction == "USER"]
    if not users or users[-1].split(":")[0] in ("root", "0"):
        problems.append(f"the runtime stage does not end as a non-root user: {users}")
    aliases = {alias for _, alias, _ in stages[:-1]}
    for instruction, argument in runtime:
        if instruction == "COPY" and "--from=" in argument:
            source_stage = re.search(r"--from=(\S+)", argument).group(1)
            if source_stage not in aliases:
                problems.append(f"COPY --from={source_stage}: no stage of that name")
    entry = [a for i, a in runtime if i == "ENTRYPOINT"]
    if not entry or not entry[-1].startswith('["'):
        problems.append("ENTRYPOINT should be in exec form, so that SIGTERM reaches greybodyd")
    for instruction, argument in stages[0][2]:
        if instruction == "COPY" and "--from=" not in argument:
            *sources, _ = shlex.split(argument)
            for source in sources:
                if not glob.glob(str(ROOT / source)):
                    problems.append(f"COPY {source}: nothing of that name in the project")
    return problems


def apt_packages(stage_commands):
    packages = set()
    for instruction, argument in stage_commands:
        if instruction == "RUN":
            for match in re.finditer(r"apt-get install ([^&;]+)", argument):
                packages |= {w for w in match.group(1).split() if not w.startswith("-")}
    return packages


def simulate_build_stage(staging_root):
    """Runs the build stage's COPY and make steps on this host; returns (staging, problems)."""
    _, _, commands = containerfile_stages()[0]
    context = staging_root / "src"
    context.mkdir(parents=True)
    problems = []
    missing = [p for p in sorted(apt_packages(commands))
               if "install ok installed" not in run(["dpkg-query", "-W", "-f=${Status}", p]).stdout]
    if missing:
        problems.append(f"build-stage packages not installed here, cannot simulate: {missing}")
        return None, problems
    staging = None
    for instruction, argument in commands:
        if instruction == "COPY" and "--from=" not in argument:
            *sources, destination = shlex.split(argument)
            for source in sources:
                for match in glob.glob(str(ROOT / source)):
                    match = pathlib.Path(match)
                    target = context / destination
                    if destination.endswith("/") or destination in ("./", "."):
                        target = target / match.name
                    target.parent.mkdir(parents=True, exist_ok=True)
                    if match.is_dir():
                        shutil.copytree(match, target, ignore=shutil.ignore_patterns("node_modules"))
                    else:
                        shutil.copy2(match, target)
        elif instruction == "RUN" and "make" in argument and "apt-get" not in argument:
            staging = staging_root / "staging"
            command = argument.replace("DESTDIR=/staging", f"DESTDIR={staging}")
            result = run(["sh", "-c", command], cwd=context)
            if result.returncode != 0:
                problems.append(f"the build stage's `{argument}` fails on the copied files:\n"
                                f"{(result.stdout + result.stderr)[-1500:]}")
                return None, problems
    if staging is None:
        problems.append("the build stage has no make step with DESTDIR=/staging")
    return staging, problems


def check_container_build_and_libraries(staging, build_problems):
    if build_problems:
        return build_problems
    stages = containerfile_stages()
    problems = []
    for instruction, argument in stages[-1][2]:
        if instruction == "COPY" and "--from=" in argument:
            source = shlex.split(argument)[1]
            if not (staging.parent / source.lstrip("/")).exists():
                problems.append(f"{argument}: the build stage does not produce {source}")
    binary = staging / INSTALLED_BINARY.lstrip("/")
    needed = re.findall(r"\(NEEDED\)\s+Shared library: \[([^\]]+)\]",
                        run(["readelf", "-d", str(binary)]).stdout)
    resolved = dict(re.findall(r"^\s*(\S+) => (\S+)", run(["ldd", str(binary)]).stdout,
                               re.MULTILINE))
    runtime_packages = apt_packages(stages[-1][2]) | BASE_IMAGE_PACKAGES
    for library in needed:
        path = resolved.get(library)
        package = None
        # dpkg knows a file by the path its package ships (/lib or /usr/lib on a merged /usr).
        for candidate in ([path, os.path.realpath(path)] if path else []):
            owner = run(["dpkg", "-S", candidate]).stdout
            if owner:
                package = owner.split(":")[0].strip()
                break
        if package is None:
            problems.append(f"{library}: no Debian package provides it here")
        elif package not in runtime_packages:
            problems.append(f"{library} comes from {package}, which the runtime stage "
                            f"does not install")
    if not needed:
        problems.append(f"readelf found no shared libraries in {binary}")
    return problems


# ---- Kubernetes ------------------------------------------------------------------------------

def load_manifests():
    documents = {}
    for path in sorted(KUBERNETES.glob("*.yaml")):
        for document in yaml.safe_load_all(path.read_text(encoding="utf-8")):
            if document is not None:
                documents[(document.get("kind"), path.name)] = document
    return documents


def by_kind(documents, kind):
    found = [d for (k, _), d in documents.items() if k == kind]
    if len(found) != 1:
        raise AssertionError(f"expected one {kind}, found {len(found)}")
    return found[0]


def check_kustomization(documents):
    listed = set(by_kind(documents, "Kustomization")["resources"])
    present = {p.name for p in KUBERNETES.glob("*.yaml")} - {"kustomization.yaml"}
    return ([f"{name} is not listed in kustomization.yaml" for name in sorted(present - listed)] +
            [f"kustomization.yaml lists {name}, which does not exist" for name in
             sorted(listed - present)])


def probe_problems(name, probe, path, ports):
    get = (probe or {}).get("httpGet", {})
    problems = []
    if get.get("path") != path:
        problems.append(f"{name}.httpGet.path is {get.get('path')!r}, not {path}")
    if get.get("port") not in ports:
        problems.append(f"{name}.httpGet.port {get.get('port')!r} is not a declared container port")
    for field in ("periodSeconds", "timeoutSeconds", "failureThreshold"):
        if not isinstance((probe or {}).get(field), int) or probe[field] <= 0:
            problems.append(f"{name}.{field} should be a positive whole number")
    return problems


def check_deployment(documents):
    deployment = by_kind(documents, "Deployment")
    pod = deployment["spec"]["template"]
    problems = []
    if not set(deployment["spec"]["selector"]["matchLabels"].items()) <= set(
            pod["metadata"]["labels"].items()):
        problems.append("the selector does not match the pod template's labels")
    flags, _ = known_flags_and_variables()
    for container in pod["spec"]["containers"]:
        name = container["name"]
        ports = {p["name"]: p["containerPort"] for p in container.get("ports", [])}
        port_refs = set(ports) | set(ports.values())
        problems += probe_problems(f"{name}.livenessProbe", container.get("livenessProbe"),
                                   "/healthz", port_refs)
        problems += probe_problems(f"{name}.readinessProbe", container.get("readinessProbe"),
                                   "/readyz", port_refs)
        for side in ("requests", "limits"):
            for resource in ("cpu", "memory"):
                if resource not in container.get("resources", {}).get(side, {}):
                    problems.append(f"{name}: resources.{side}.{resource} is not set")
        args = container.get("args", [])
        problems += [f"{name}: greybodyd has no flag {a}" for a in args
                     if a.startswith("--") and a.split("=")[0] not in flags]
        listen = args[args.index("--listen") + 1] if "--listen" in args else ""
        if not listen.endswith(":" + str(ports.get("http"))):
            problems.append(f"{name}: --listen {listen!r} is not on the http port {ports.get('http')}")
        security = container.get("securityContext", {})
        for field, value in (("allowPrivilegeEscalation", False), ("readOnlyRootFilesystem", True)):
            if security.get(field) is not value:
                problems.append(f"{name}: securityContext.{field} should be {value}")
        if "ALL" not in security.get("capabilities", {}).get("drop", []):
            problems.append(f"{name}: capabilities are not all dropped")
        drain = int(args[args.index("--drain-timeout") + 1]) if "--drain-timeout" in args else 10
        pre_stop = container.get("lifecycle", {}).get("preStop", {}).get("exec", {}).get("command", [])
        pause = int(pre_stop[1]) if pre_stop[:1] == ["sleep"] else 0
        grace = pod["spec"].get("terminationGracePeriodSeconds", 30)
        if grace <= drain + pause:
            problems.append(f"terminationGracePeriodSeconds {grace} ≤ preStop {pause} s + drain {drain} s")
    if pod["spec"].get("securityContext", {}).get("runAsNonRoot") is not True:
        problems.append("the pod does not require runAsNonRoot")
    return problems


def check_service_and_autoscaler(documents):
    deployment = by_kind(documents, "Deployment")
    service = by_kind(documents, "Service")
    autoscaler = by_kind(documents, "HorizontalPodAutoscaler")
    labels = deployment["spec"]["template"]["metadata"]["labels"]
    container = deployment["spec"]["template"]["spec"]["containers"][0]
    ports = {p["name"]: p["containerPort"] for p in container["ports"]}
    problems = []
    if not set(service["spec"]["selector"].items()) <= set(labels.items()):
        problems.append("the Service's selector does not select the Deployment's pods")
    for port in service["spec"]["ports"]:
        if port["targetPort"] not in set(ports) | set(ports.values()):
            problems.append(f"Service targetPort {port['targetPort']} is not a container port")
    target = autoscaler["spec"]["scaleTargetRef"]
    if (target.get("kind"), target.get("name")) != ("Deployment", deployment["metadata"]["name"]):
        problems.append(f"the autoscaler targets {target}, not the Deployment")
    cpu = [m for m in autoscaler["spec"].get("metrics", [])
           if m.get("resource", {}).get("name") == "cpu"]
    if not cpu:
        problems.append("the autoscaler does not scale on CPU")
    if not 1 <= autoscaler["spec"].get("minReplicas", 1) <= autoscaler["spec"]["maxReplicas"]:
        problems.append("minReplicas/maxReplicas out of order")
    return problems


# ---- nginx -------------------------------------------------------------------------------------

def check_nginx_configuration():
    with tempfile.TemporaryDirectory(prefix="greybody-nginx-") as prefix:
        ok, output = Nginx(prefix, SHIPPED_SITE.read_text(encoding="utf-8")).test()
        return [] if ok else [f"nginx -t: {output}"]


def main():
    report = SuiteReport("deploy")
    report.check("systemd unit hardening and settings", check_unit_hardening)
    report.check("container stages, user and sources", check_container_shape)
    with tempfile.TemporaryDirectory(prefix="greybody-container-") as temporary:
        staging, build_problems = simulate_build_stage(pathlib.Path(temporary))
        report.check("container build stage and runtime libraries",
                     check_container_build_and_libraries, staging, build_problems)
        report.check("systemd-analyze verify and security", check_unit_verifies, staging)
    documents = load_manifests()
    report.check("kubernetes kustomization", check_kustomization, documents)
    report.check("kubernetes deployment", check_deployment, documents)
    report.check("kubernetes service and autoscaler", check_service_and_autoscaler, documents)
    report.check("nginx -t", check_nginx_configuration)
    report.exit()


if __name__ == "__main__":
    main()

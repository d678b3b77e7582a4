// Reference fixtures from the Flexible Collision Library (FCL 0.7, Debian's libfcl-dev).
//
// Builds random pairs of convex primitives (sphere, capsule, box, cylinder: every one of the ten
// combinations) in four regimes (far, near, touching, overlapping) and records, for each pair,
// FCL's separation distance (fcl::distance) and its yes/no collision answer (fcl::collide), both
// with FCL's own GJK solver (GST_INDEP). Writes fixtures/fcl.json. Deterministic: a fixed seed
// and a fixed generator (splitmix64), so regenerating gives the same file on the same FCL.
//
// Shapes in the fixture (SI units, m):
//   sphere   {"k":"sphere","c":[x,y,z],"r":r}
//   capsule  {"k":"capsule","from":[..],"to":[..],"r":r}     (segment from → to, radius r)
//   box      {"k":"box","p":[..],"q":[w,x,y,z],"s":[sx,sy,sz]} (centre p, full side lengths s)
//   cylinder {"k":"cylinder","p":[..],"q":[w,x,y,z],"r":r,"l":l} (axis along the pose's z, centred,
//                                                               full length l)
// Facts about FCL used here (its shape headers): Box takes full side lengths; Capsule and
// Cylinder are centred on their origin with the axis along local z and `lz` the full length of the
// axis segment (the capsule's caps extend beyond it by the radius).
//
// Every number written is rounded to 12 significant digits first and FCL is given exactly the
// rounded values, so the file holds the exact inputs of each reference answer. Quaternions are
// normalised by the reader (both here and in the test) after parsing.
//
// How a pair in a regime is made: B is placed at A's centre plus s·u for a random direction u.
// The distance between A and B moved along a line is a convex function of s (it is the distance
// from the origin to a translated convex set), zero near s = 0, so bisection on s finds the place
// with a given gap. Overlapping pairs back off from the touching place by a random fraction.
// Touching pairs sit just apart (gap +δ) or just overlapping (the touching place moved δ
// inwards), with δ = 1 nm for pairs with a sphere (FCL answers those in closed form) and δ = 1 µm
// for the others (FCL's answers there are iterative; its two solvers differ by up to 1e-7 m).
//
// Build and run (tests/reference/regenerate.sh does this):
//   g++ -O2 -std=c++17 fcl_fixtures.cpp -I/usr/include/eigen3 -lfcl -lccd -o fcl_fixtures
//   ./fcl_fixtures > fixtures/fcl.json
//   ./fcl_fixtures cell > fixtures/fcl_cell.json   (an arm in a cell: every checked pair, see cellMain)
#include <fcl/fcl.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <memory>
#include <string>
#include <vector>

using S = double;
using Vec3 = fcl::Vector3<S>;

namespace {

uint64_t state = 0x5eed2026c0111de5ULL;

// splitmix64 (Steele, Lea and Flood, "Fast splittable pseudorandom number generators", 2014).
uint64_t next() {
  uint64_t z = (state += 0x9e3779b97f4a7c15ULL);
  z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
  z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
  return z ^ (z >> 31);
}

double uniform(double lo, double hi) { return lo + (hi - lo) * (double)(next() >> 11) * (1.0 / 9007199254740992.0); }

double round12(double v) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.12g", v);
  return std::strtod(buf, nullptr);
}

Vec3 randomUnit() {
  while (true) {
    Vec3 v(uniform(-1, 1), uniform(-1, 1), uniform(-1, 1));
    double n = v.norm();
    if (n > 0.1 && n <= 1) return v / n;
  }
}

enum Kind { SPHERE = 0, CAPSULE = 1, BOX = 2, CYLINDER = 3 };
const char* KIND_NAMES[] = {"sphere", "capsule", "box", "cylinder"};

struct Shape {
  Kind kind;
  Vec3 p;          // centre (sphere, box, cylinder); capsule: from
  Vec3 to;         // capsule: to
  double q[4];     // w, x, y, z (box, cylinder)
  Vec3 size;       // box full sides
  double r = 0;    // sphere, capsule, cylinder radius
  double l = 0;    // cylinder full length

  fcl::Matrix3<S> rotation() const {
    fcl::Quaternion<S> quat(q[0], q[1], q[2], q[3]);
    quat.normalize();
    return quat.toRotationMatrix();
  }

  // The FCL geometry and its pose.
  std::shared_ptr<fcl::CollisionGeometry<S>> geometry() const {
    switch (kind) {
      case SPHERE: return std::make_shared<fcl::Sphere<S>>(r);
      case CAPSULE: return std::make_shared<fcl::Capsule<S>>(r, (to - p).norm());
      case BOX: return std::make_shared<fcl::Box<S>>(size[0], size[1], size[2]);
      default: return std::make_shared<fcl::Cylinder<S>>(r, l);
    }
  }

  fcl::Transform3<S> pose(const Vec3& shift) const {
    fcl::Transform3<S> t = fcl::Transform3<S>::Identity();
    if (kind == SPHERE) {
      t.translation() = p + shift;
    } else if (kind == CAPSULE) {
      // Capsule frame: origin at the midpoint, z along from → to (x, y any completing frame; any
      // frame for a capsule of zero length, a sphere).
      Vec3 z = (to - p).norm() > 0 ? Vec3((to - p).normalized()) : Vec3(0, 0, 1);
      Vec3 helper = std::abs(z[0]) < 0.9 ? Vec3(1, 0, 0) : Vec3(0, 1, 0);
      Vec3 x = helper.cross(z).normalized();
      Vec3 y = z.cross(x);
      fcl::Matrix3<S> R;
      R.col(0) = x; R.col(1) = y; R.col(2) = z;
      t.linear() = R;
      t.translation() = 0.5 * (p + to) + shift;
    } else {
      t.linear() = rotation();
      t.translation() = p + shift;
    }
    return t;
  }

  Vec3 centre() const { return kind == CAPSULE ? Vec3(0.5 * (p + to)) : p; }

  void translate(const Vec3& d) {
    p += d;
    if (kind == CAPSULE) to += d;
  }
};

Vec3 roundVec(const Vec3& v) { return Vec3(round12(v[0]), round12(v[1]), round12(v[2])); }

Shape randomShape(Kind kind) {
  Shape s;
  s.kind = kind;
  s.p = roundVec(Vec3(uniform(-0.5, 0.5), uniform(-0.5, 0.5), uniform(-0.5, 0.5)));
  s.q[0] = 1; s.q[1] = s.q[2] = s.q[3] = 0;
  if (kind == SPHERE) {
    s.r = round12(uniform(0.01, 0.25));
  } else if (kind == CAPSULE) {
    s.r = round12(uniform(0.01, 0.15));
    s.to = roundVec(s.p + uniform(0.02, 0.6) * randomUnit());
  } else {
    // Uniform random rotation (Shoemake's method from three uniforms).
    double u1 = uniform(0, 1), u2 = uniform(0, 2 * M_PI), u3 = uniform(0, 2 * M_PI);
    double a = std::sqrt(1 - u1), b = std::sqrt(u1);
    s.q[0] = round12(a * std::sin(u2)); s.q[1] = round12(a * std::cos(u2));
    s.q[2] = round12(b * std::sin(u3)); s.q[3] = round12(b * std::cos(u3));
    if (kind == BOX) {
      s.size = roundVec(Vec3(uniform(0.02, 0.6), uniform(0.02, 0.6), uniform(0.02, 0.6)));
    } else {
      s.r = round12(uniform(0.01, 0.25));
      s.l = round12(uniform(0.02, 0.6));
    }
  }
  return s;
}

struct Answer {
  double distance;     // FCL's separation distance (GJKSolver_indep); -1 when FCL reports a collision
  double distanceCcd;  // the same with FCL's libccd solver (GJKSolver_libccd)
  bool hit;            // fcl::collide found a contact (GJKSolver_indep)
  bool hitCcd;         // the same with the libccd solver
};

double fclDistance(const fcl::CollisionGeometry<S>* ga, const fcl::Transform3<S>& ta, const fcl::CollisionGeometry<S>* gb, const fcl::Transform3<S>& tb, fcl::GJKSolverType solver) {
  fcl::DistanceRequest<S> req(true, false, 0.0, 0.0, 1e-12, solver);
  fcl::DistanceResult<S> res;
  return fcl::distance(ga, ta, gb, tb, req, res);
}

bool fclCollide(const fcl::CollisionGeometry<S>* ga, const fcl::Transform3<S>& ta, const fcl::CollisionGeometry<S>* gb, const fcl::Transform3<S>& tb, fcl::GJKSolverType solver) {
  fcl::CollisionRequest<S> req(1, false, 1, false, true, solver, 1e-13);
  fcl::CollisionResult<S> res;
  fcl::collide(ga, ta, gb, tb, req, res);
  return res.isCollision();
}

Answer query(const Shape& a, const Shape& b) {
  auto ga = a.geometry(), gb = b.geometry();
  fcl::Transform3<S> ta = a.pose(Vec3::Zero()), tb = b.pose(Vec3::Zero());
  return {fclDistance(ga.get(), ta, gb.get(), tb, fcl::GST_INDEP), fclDistance(ga.get(), ta, gb.get(), tb, fcl::GST_LIBCCD),
          fclCollide(ga.get(), ta, gb.get(), tb, fcl::GST_INDEP), fclCollide(ga.get(), ta, gb.get(), tb, fcl::GST_LIBCCD)};
}

// Places b at a's centre + s·u (b keeps its shape and orientation) and returns the FCL distance.
double distanceAt(const Shape& a, Shape b, const Vec3& u, double s) {
  b.translate(a.centre() - b.centre() + s * u);
  Answer ans = query(a, b);
  // both solvers answer with the length of a point of the Minkowski difference (an upper bound of
  // the distance), so the smaller one is the better; a reported collision counts as 0
  double d = std::min(std::max(ans.distance, 0.0), std::max(ans.distanceCcd, 0.0));
  return d;
}

// Smallest s with FCL distance ≥ gap along u (bisection on the convex distance along the line).
double placeAtGap(const Shape& a, const Shape& b, const Vec3& u, double gap) {
  double lo = 0, hi = 0.1;
  while (distanceAt(a, b, u, hi) < gap) hi *= 2;
  for (int i = 0; i < 200 && hi - lo > 1e-15; i++) {
    double mid = 0.5 * (lo + hi);
    if (distanceAt(a, b, u, mid) < gap) lo = mid; else hi = mid;
  }
  return hi;
}

void printVec(const Vec3& v) { std::printf("[%.12g,%.12g,%.12g]", v[0], v[1], v[2]); }

void printShape(const Shape& s) {
  std::printf("{\"k\":\"%s\"", KIND_NAMES[s.kind]);
  if (s.kind == SPHERE) {
    std::printf(",\"c\":"); printVec(s.p); std::printf(",\"r\":%.12g", s.r);
  } else if (s.kind == CAPSULE) {
    std::printf(",\"from\":"); printVec(s.p); std::printf(",\"to\":"); printVec(s.to); std::printf(",\"r\":%.12g", s.r);
  } else {
    std::printf(",\"p\":"); printVec(s.p);
    std::printf(",\"q\":[%.12g,%.12g,%.12g,%.12g]", s.q[0], s.q[1], s.q[2], s.q[3]);
    if (s.kind == BOX) { std::printf(",\"s\":"); printVec(s.size); }
    else std::printf(",\"r\":%.12g,\"l\":%.12g", s.r, s.l);
  }
  std::printf("}");
}

}  // namespace

// ---- the cell: an invented arm in an invented cell, every checked pair at seeded configurations ----
//
// The arm's forward kinematics are written out here (standard DH: link i = Rz(θ+q)·Tz(d)·Tx(a)·Rx(α),
// base = the cell's base pose, tool point = flange · arm tool, TCP = tool point · tcp), the shapes
// are placed by them, and FCL answers each pair of bodies (the smallest distance over their
// shapes; a collision when any shape pair collides). The pairs follow the product's rules: every
// body against every obstacle, links two or more apart (the base is link 0), tool and payload
// against base … link n−1, less the ignored pairs. The arm and the requirement set are written
// into the fixture so the test can run the `clearance` command on the same files.

struct Dh { double a, alpha, d, theta; };
struct Cap { int body; Vec3 from, to; double r; };           // body 0 base, 1..n links, n+1 tool, n+2 payload
struct Blk { int body; Vec3 c; double yaw; Vec3 size; };       // a box on the tool (its pose: translation, yaw)

fcl::Transform3<S> dhLink(const Dh& j, double q) {
  fcl::Transform3<S> t = fcl::Transform3<S>::Identity();
  t.rotate(Eigen::AngleAxis<S>(j.theta + q, Vec3::UnitZ()));
  t.translate(Vec3(0, 0, j.d));
  t.translate(Vec3(j.a, 0, 0));
  t.rotate(Eigen::AngleAxis<S>(j.alpha, Vec3::UnitX()));
  return t;
}

fcl::Transform3<S> poseOf(const Vec3& p, double roll, double pitch, double yaw) {
  fcl::Transform3<S> t = fcl::Transform3<S>::Identity();
  t.translate(p);
  t.rotate(Eigen::AngleAxis<S>(yaw, Vec3::UnitZ()) * Eigen::AngleAxis<S>(pitch, Vec3::UnitY()) * Eigen::AngleAxis<S>(roll, Vec3::UnitX()));
  return t;
}

void printPose(const fcl::Transform3<S>& t) {
  std::printf("[");
  for (int r = 0; r < 4; r++) for (int c = 0; c < 4; c++) {
    double v = r < 3 ? (c < 3 ? t.linear()(r, c) : t.translation()[r]) : (c == 3 ? 1.0 : 0.0);
    std::printf("%s%.17g", r == 0 && c == 0 ? "" : ",", v);
  }
  std::printf("]");
}

struct Placed { int body; std::shared_ptr<fcl::CollisionGeometry<S>> g; fcl::Transform3<S> t; };

fcl::Transform3<S> capsuleFrame(const Vec3& a, const Vec3& b) {
  Shape s; s.kind = CAPSULE; s.p = a; s.to = b;
  return s.pose(Vec3::Zero());
}

int cellMain() {
  const double PI = M_PI;
  const std::vector<Dh> dh = {{0, PI / 2, 0.3, 0}, {0.35, 0, 0, PI / 2}, {0.05, PI / 2, 0, 0}, {0, -PI / 2, 0.3, 0}, {0, PI / 2, 0, 0}, {0, 0, 0.08, 0}};
  const int n = (int)dh.size();
  const std::vector<Cap> caps = {
    {0, {0, 0, 0.065}, {0, 0, 0.1}, 0.06},
    {1, {0, -0.2, 0}, {0, 0, 0}, 0.06}, {2, {-0.35, 0, 0}, {0, 0, 0}, 0.05}, {3, {-0.05, 0, 0}, {0, 0, 0}, 0.05},
    {4, {0, 0.3, 0}, {0, 0, 0}, 0.04}, {5, {0, 0, 0}, {0, 0, 0}, 0.035}, {6, {0, 0, -0.08}, {0, 0, 0}, 0.03},
    {7, {0, 0, 0.03}, {0, 0, 0.08}, 0.02},   // tool, in the tool-point frame
    {8, {0, 0, 0}, {0, 0, 0.03}, 0.015},     // payload, in the TCP frame
  };
  const Blk toolBox = {7, {0, 0, 0.095}, 0.3, {0.04, 0.02, 0.03}};
  const std::vector<std::pair<int, int>> ignored = {{2, 4}, {4, 6}};
  const fcl::Transform3<S> base = poseOf(Vec3(0.1, -0.2, 0.5), 0, 0, PI / 6);
  fcl::Transform3<S> armTool = fcl::Transform3<S>::Identity(); armTool.translate(Vec3(0, 0, 0.02));
  fcl::Transform3<S> tcp = fcl::Transform3<S>::Identity(); tcp.translate(Vec3(0, 0, 0.1));
  // obstacles
  struct Obs { const char* name; int kind; fcl::Transform3<S> t; Vec3 size; double r, l; Vec3 from, to; };
  std::vector<Obs> obs = {
    {"table", BOX, poseOf(Vec3(0.55, 0.0, 0.42), 0, 0, 0.17), Vec3(0.6, 0.8, 0.1), 0, 0, {}, {}},
    {"ball", SPHERE, poseOf(Vec3(0.45, 0.3, 1.0), 0, 0, 0), {}, 0.08, 0, {}, {}},
    {"post", CYLINDER, poseOf(Vec3(0.3, -0.55, 0.8), 0.35, 0, 0), {}, 0.04, 0.6, {}, {}},
    {"bar", CAPSULE, fcl::Transform3<S>::Identity(), {}, 0.03, 0, Vec3(0.1, 0.45, 1.25), Vec3(0.7, 0.35, 1.05)},
  };
  // ---- the files
  std::printf("{\"source\":\"FCL %s (libfcl-dev), both GJK solvers; tests/reference/fcl_fixtures.cpp (cell)\",\n", FCL_VERSION);
  std::printf("\"arm\":{\"name\":\"Cell reference arm\",\"convention\":\"dh\",\"joints\":[");
  for (int i = 0; i < n; i++) {
    std::printf("%s{\"type\":\"revolute\",\"a\":%.17g,\"alpha\":%.17g,\"d\":%.17g,\"theta\":%.17g,\"min\":-3.2,\"max\":3.2,\"collision\":[", i ? "," : "", dh[i].a, dh[i].alpha, dh[i].d, dh[i].theta);
    bool f = true;
    for (const Cap& c : caps) if (c.body == i + 1) { std::printf("%s{\"from\":", f ? "" : ","); printVec(c.from); std::printf(",\"to\":"); printVec(c.to); std::printf(",\"radius\":%.17g}", c.r); f = false; }
    std::printf("]}");
  }
  std::printf("],\"tool\":"); printPose(armTool);
  std::printf(",\"baseCollision\":[{\"from\":"); printVec(caps[0].from); std::printf(",\"to\":"); printVec(caps[0].to); std::printf(",\"radius\":%.17g}]", caps[0].r);
  std::printf(",\"ignoredPairs\":[[2,4],[4,6]]},\n");
  std::printf("\"requirements\":{\"name\":\"Cell reference\",\"base\":"); printPose(base);
  std::printf(",\"tool\":{\"tcp\":"); printPose(tcp);
  std::printf(",\"mass\":0,\"cog\":[0,0,0],\"collision\":[{\"shape\":\"capsule\",\"from\":"); printVec(caps[7].from); std::printf(",\"to\":"); printVec(caps[7].to);
  std::printf(",\"radius\":%.17g},{\"shape\":\"box\",\"name\":\"jaw\",\"pose\":", caps[7].r); printPose(poseOf(toolBox.c, 0, 0, toolBox.yaw));
  std::printf(",\"size\":"); printVec(toolBox.size);
  std::printf("}]},\"payload\":{\"mass\":0,\"cog\":[0,0,0],\"collision\":[{\"from\":"); printVec(caps[8].from); std::printf(",\"to\":"); printVec(caps[8].to); std::printf(",\"radius\":%.17g}]}", caps[8].r);
  std::printf(",\"targets\":[{\"name\":\"on the table\",\"position\":[0.5,0,0.6],\"rpy\":[3.14159,0,0],\"mode\":\"axis\",\"contact\":[\"table\"]}],\"paths\":[],\"specs\":[],\"cell\":{\"clearance\":0.01,\"obstacles\":[");
  for (size_t k = 0; k < obs.size(); k++) {
    const Obs& o = obs[k];
    std::printf("%s{\"name\":\"%s\",\"shape\":\"%s\"", k ? "," : "", o.name, KIND_NAMES[o.kind]);
    if (o.kind == BOX) { std::printf(",\"pose\":"); printPose(o.t); std::printf(",\"size\":"); printVec(o.size); }
    if (o.kind == SPHERE) { std::printf(",\"center\":"); printVec(o.t.translation()); std::printf(",\"radius\":%.17g", o.r); }
    if (o.kind == CYLINDER) { std::printf(",\"pose\":"); printPose(o.t); std::printf(",\"radius\":%.17g,\"length\":%.17g", o.r, o.l); }
    if (o.kind == CAPSULE) { std::printf(",\"from\":"); printVec(o.from); std::printf(",\"to\":"); printVec(o.to); std::printf(",\"radius\":%.17g", o.r); }
    std::printf("}");
  }
  std::printf("]}},\n\"configs\":[\n");
  // ---- configurations and answers
  const char* names[] = {"base", "link 1", "link 2", "link 3", "link 4", "link 5", "link 6", "tool", "payload"};
  for (int c = 0; c < 60; c++) {
    std::vector<double> q(n);
    for (int i = 0; i < n; i++) q[i] = c == 0 ? 0 : round12(uniform(-3.0, 3.0) * (c < 30 ? 0.5 : 1.0));
    std::vector<fcl::Transform3<S>> frame(n + 3);   // 0..n link frames, n+1 tool point, n+2 TCP
    frame[0] = base;
    for (int i = 0; i < n; i++) frame[i + 1] = frame[i] * dhLink(dh[i], q[i]);
    frame[n + 1] = frame[n] * armTool;
    frame[n + 2] = frame[n + 1] * tcp;
    std::vector<Placed> placed;
    for (const Cap& cp : caps) {
      const fcl::Transform3<S>& F = cp.body == 0 ? base : frame[cp.body];
      Vec3 a = F * cp.from, b = F * cp.to;
      placed.push_back({cp.body, std::make_shared<fcl::Capsule<S>>(cp.r, (b - a).norm()), capsuleFrame(a, b)});
    }
    placed.push_back({toolBox.body, std::make_shared<fcl::Box<S>>(toolBox.size[0], toolBox.size[1], toolBox.size[2]), frame[n + 1] * poseOf(toolBox.c, 0, 0, toolBox.yaw)});
    std::vector<Placed> others;
    for (const Obs& o : obs) {
      if (o.kind == BOX) others.push_back({-1, std::make_shared<fcl::Box<S>>(o.size[0], o.size[1], o.size[2]), o.t});
      else if (o.kind == SPHERE) others.push_back({-1, std::make_shared<fcl::Sphere<S>>(o.r), o.t});
      else if (o.kind == CYLINDER) others.push_back({-1, std::make_shared<fcl::Cylinder<S>>(o.r, o.l), o.t});
      else others.push_back({-1, std::make_shared<fcl::Capsule<S>>(o.r, (o.to - o.from).norm()), capsuleFrame(o.from, o.to)});
    }
    auto pairAnswer = [&](int a, int b, int obstacle, double* d, bool* hit) {
      *d = 1e300; *hit = false;
      for (const Placed& x : placed) {
        if (x.body != a) continue;
        if (obstacle >= 0) {
          const Placed& y = others[obstacle];
          double d1 = fclDistance(x.g.get(), x.t, y.g.get(), y.t, fcl::GST_INDEP), d2 = fclDistance(x.g.get(), x.t, y.g.get(), y.t, fcl::GST_LIBCCD);
          *d = std::min(*d, std::min(std::max(d1, 0.0), std::max(d2, 0.0)));
          *hit = *hit || fclCollide(x.g.get(), x.t, y.g.get(), y.t, fcl::GST_INDEP);
        } else for (const Placed& y : placed) {
          if (y.body != b) continue;
          double d1 = fclDistance(x.g.get(), x.t, y.g.get(), y.t, fcl::GST_INDEP), d2 = fclDistance(x.g.get(), x.t, y.g.get(), y.t, fcl::GST_LIBCCD);
          *d = std::min(*d, std::min(std::max(d1, 0.0), std::max(d2, 0.0)));
          *hit = *hit || fclCollide(x.g.get(), x.t, y.g.get(), y.t, fcl::GST_INDEP);
        }
      }
    };
    std::printf("%s{\"q\":[", c ? ",\n" : "");
    for (int i = 0; i < n; i++) std::printf("%s%.12g", i ? "," : "", q[i]);
    std::printf("],\"pairs\":[");
    bool first = true;
    for (int a = 0; a <= n + 2; a++) {
      for (int b = a + 1; b <= n + 2; b++) {
        bool armPair = b <= n;
        if (armPair && b - a < 2) continue;
        if (!armPair && a > n - 1) continue;
        bool skip = false;
        for (auto& p : ignored) if (p.first == a && p.second == b) skip = true;
        if (skip) continue;
        double d; bool hit;
        pairAnswer(a, b, -1, &d, &hit);
        std::printf("%s{\"a\":\"%s\",\"b\":\"%s\",\"distance\":%.17g,\"collide\":%s}", first ? "" : ",", names[a], names[b], d, hit ? "true" : "false");
        first = false;
      }
      for (size_t k = 0; k < obs.size(); k++) {
        double d; bool hit;
        pairAnswer(a, -1, (int)k, &d, &hit);
        std::printf("%s{\"a\":\"%s\",\"b\":\"%s\",\"distance\":%.17g,\"collide\":%s}", first ? "" : ",", names[a], obs[k].name, d, hit ? "true" : "false");
        first = false;
      }
    }
    std::printf("]}");
  }
  std::printf("\n]}\n");
  return 0;
}

int main(int argc, char** argv) {
  if (argc > 1 && std::string(argv[1]) == "cell") return cellMain();
  const int PER_REGIME = 55;
  const char* REGIMES[] = {"far", "near", "touching", "overlapping"};
  std::printf("{\"source\":\"FCL %s (libfcl-dev), GJKSolver_indep; tests/reference/fcl_fixtures.cpp\",\n\"pairs\":[\n", FCL_VERSION);
  bool first = true;
  for (int ka = 0; ka < 4; ka++) {
    for (int kb = ka; kb < 4; kb++) {
      for (int regime = 0; regime < 4; regime++) {
        for (int k = 0; k < PER_REGIME; k++) {
          Shape a = randomShape((Kind)ka), b = randomShape((Kind)kb);
          Vec3 u = randomUnit();
          // touching: within 1 nm of contact where FCL answers both questions in closed form
          // (pairs with a sphere), within 1 µm where its answers are iterative (GJK)
          double touch = ka == SPHERE ? 1e-9 : 1e-6;
          double s;
          if (regime == 0) s = placeAtGap(a, b, u, uniform(0.02, 0.6));
          else if (regime == 1) s = placeAtGap(a, b, u, std::exp(uniform(std::log(1e-4), std::log(1e-2))));
          else if (regime == 2) s = k % 2 == 0 ? placeAtGap(a, b, u, touch) : placeAtGap(a, b, u, 1e-12) - touch;
          else s = placeAtGap(a, b, u, 1e-12) * uniform(0.3, 0.995);
          b.translate(a.centre() - b.centre() + s * u);
          b.p = roundVec(b.p);
          if (b.kind == CAPSULE) b.to = roundVec(b.to);
          Answer ans = query(a, b);
          std::printf("%s{\"regime\":\"%s\",\"a\":", first ? "" : ",\n", REGIMES[regime]);
          printShape(a);
          std::printf(",\"b\":");
          printShape(b);
          std::printf(",\"distance\":%.17g,\"distanceCcd\":%.17g,\"collide\":%s,\"collideCcd\":%s}", ans.distance, ans.distanceCcd, ans.hit ? "true" : "false", ans.hitCcd ? "true" : "false");
          first = false;
        }
      }
    }
  }
  std::printf("\n]}\n");
  return 0;
}

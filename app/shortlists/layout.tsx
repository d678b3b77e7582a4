import "./shortlist.css";

export default function ShortlistsLayout({ children }: { children: React.ReactNode }) {
  return children;
}

export default function Placeholder() { return null; }
